import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_SEASON } from '../../db/demo/shelf';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { settleUp } from '../../src/lib/settle-up';
import { type Browser, openBrowser, signInToTeam, signUpWithTeam } from '../helpers/browser';

const appUrl = inject('appUrl');

/** The season's money as a team keeps it: a budget, purchases, and settling up. */
describe('the season budget, in chromium', () => {
	const opened: Browser[] = [];
	afterAll(async () => {
		for (const b of opened) await b.close();
	});

	for (const viewport of [
		{ width: 1366, height: 900 },
		{ width: 390, height: 844 },
	])
		it(`a captain starts a season and records a purchase, and the figures follow at ${viewport.width} px`, async () => {
			const b = await openBrowser({ viewport });
			opened.push(b);
			const stamp = Date.now();
			await signUpWithTeam(b, appUrl, {
				name: 'Budget Lead',
				email: `budget-${viewport.width}-${stamp}@sagwise.test`,
				password: 'budget-captain-2026',
				team: `Budget Team ${viewport.width} ${stamp}`,
			});
			await b.page.getByRole('link', { name: 'Season budget' }).click();
			await b.page.waitForURL(/\/season$/);
			await b.page.getByText('Start a season with its budget').click();
			const start = b.page.getByRole('form', { name: 'Start a season' });
			await start.getByLabel('Name').fill('Test season');
			await start.getByLabel('From').fill('2026-01-01');
			await start.getByLabel('To').fill('2026-12-31');
			await start.getByLabel('Budget').fill('1000');
			await start.getByRole('button', { name: 'Start the season' }).click();
			const record = b.page.getByRole('form', { name: 'Record a purchase' });
			await record.waitFor();
			await record.getByLabel('Item').fill('Ring terminals');
			await record.getByLabel('Date').fill('2026-06-01');
			await record.getByLabel('Quantity').fill('2');
			await record.getByLabel('Unit price').fill('34.5');
			await record.getByRole('button', { name: 'Record the purchase' }).click();
			const figures = b.page.locator('[data-season-figures]');
			await expect.poll(() => figures.textContent()).toMatch(/Spent\$69\.00/);
			await expect(figures.textContent()).resolves.toMatch(/Left\$931\.00/);
			await expect(
				b.page.getByRole('row', { name: /Ring terminals/ }).textContent(),
			).resolves.toMatch(/34\.50.*\$69\.00.*Budget Lead/);
			// A photo of the receipt, added from the purchase's row.
			await b.page.getByLabel('Add receipt photo for Ring terminals').setInputFiles({
				name: 'till.png',
				mimeType: 'image/png',
				buffer: Buffer.from(
					'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
					'base64',
				),
			});
			const link = b.page.getByRole('link', { name: 'Receipt for Ring terminals' });
			await link.waitFor();
			const served = await b.page.request.get(
				new URL((await link.getAttribute('href'))!, appUrl).href,
			);
			expect(served.headers()['content-type']).toBe('image/png');
			await b.screenshot(`season-${viewport.width}`);
			expect(b.problems).toEqual([]);
		}, 90_000);

	it('a member reads the demo season: its spending, and who pays whom to settle up', async () => {
		const b = await openBrowser({ viewport: { width: 1366, height: 900 } });
		opened.push(b);
		await signInToTeam(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
		await b.page.getByRole('link', { name: 'Season budget' }).click();
		await b.page.waitForURL(/\/season$/);
		const spent = DEMO_SEASON.purchases.reduce((n, p) => n + p.quantity * p.unitPriceMinor, 0);
		const figures = b.page.locator('[data-season-figures]');
		await expect(figures.textContent()).resolves.toContain(
			`Spent$${(spent / 100).toLocaleString('en', { minimumFractionDigits: 2 })}`,
		);
		// The demo's captain and member share it evenly; the transfers come from the same rule.
		const payers = DEMO_USERS.filter((u) => u.role !== 'viewer').map((u, i) => ({
			id: String(i),
			name: u.name,
		}));
		const expected = settleUp(
			payers,
			DEMO_SEASON.purchases.map((p) => ({
				paidBy: String(p.payer),
				paidByName: DEMO_USERS[p.payer]!.name,
				amountMinor: p.quantity * p.unitPriceMinor,
			})),
		);
		const t = expected.transfers[0]!;
		await expect(b.page.locator('[data-transfers]').textContent()).resolves.toContain(
			`${t.from} pays ${t.to} $${(t.amountMinor / 100).toFixed(2)}`,
		);
		await b.page.locator('[data-testid="season-spend"] canvas').waitFor();
		expect(b.problems).toEqual([]);
	}, 60_000);
});
