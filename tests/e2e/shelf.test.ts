import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { marlinBuild, pebbleBuild } from '../../db/demo/builds';
import { DEMO_SHELF } from '../../db/demo/shelf';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { minorToText } from '../../src/lib/money';
import { type Browser, openBrowser, openDemoVehicle, signUpWithBuild } from '../helpers/browser';

const appUrl = inject('appUrl');

/**
 * The team's parts shelf as a captain keeps it: an entry added and saved on the shelf page, a
 * CSV with a bad row refused by row, then a bank started from the entry in the build and in a
 * plan (whose parts to buy take its price).
 */
describe('the parts shelf, in chromium', () => {
	let b: Browser;
	let buildUrl: string;
	let teamId: string;
	beforeAll(async () => {
		b = await openBrowser({ viewport: { width: 1366, height: 900 } });
		buildUrl = await signUpWithBuild(b, appUrl, {
			name: 'Shelf',
			slug: 'shelf',
			document: pebbleBuild,
		});
		teamId = /\/teams\/([0-9a-f-]{36})/.exec(buildUrl)![1]!;
	}, 120_000);
	afterAll(async () => b?.close());

	for (const viewport of [
		{ width: 1366, height: 900 },
		{ width: 390, height: 844 },
	])
		it(`adds an entry with its price and keeps it after a reload at ${viewport.width} px`, async () => {
			await b.page.setViewportSize(viewport);
			await b.page.goto(`${appUrl}/teams/${teamId}`);
			await b.page.getByRole('link', { name: 'Parts shelf' }).click();
			await b.page.waitForURL(/\/shelf$/);
			const name = `Garage AGM ${viewport.width}`;
			await b.page.getByLabel('Add to the shelf').selectOption('banks');
			await b.page.getByRole('button', { name: 'Add', exact: true }).click();
			// The work goes on in the new row: its name field has focus.
			const label = b.page.getByLabel('New battery bank: Bank');
			await expect.poll(() => label.evaluate((el) => el === document.activeElement)).toBe(true);
			await label.fill(name);
			await b.page.getByLabel(`${name}: Capacity/unit`).fill('120');
			await b.page.getByLabel(`${name}: Price`).fill('189.9');
			await b.page.getByLabel(`${name}: Have`).fill('2');
			await b.page.getByRole('button', { name: /Save changes/ }).click();
			await expect
				.poll(() => b.page.getByRole('status').first().textContent())
				.toMatch(/Saved 1 entry/);
			await b.screenshot(`shelf-${viewport.width}`);
			await b.page.reload();
			await expect(b.page.getByLabel(`${name}: Capacity/unit`).inputValue()).resolves.toBe('120');
			await expect(b.page.getByLabel(`${name}: Price`).inputValue()).resolves.toBe('189.90');
			expect(b.problems).toEqual([]);
		}, 60_000);

	it('refuses a CSV with a bad row, naming it, and adds nothing', async () => {
		await b.page.setViewportSize({ width: 1366, height: 900 });
		await b.page.goto(`${appUrl}/teams/${teamId}/shelf`);
		const before = await b.page.locator('tbody tr').count();
		await b.page.getByLabel('Add entries from a CSV file').setInputFiles({
			name: 'shelf.csv',
			mimeType: 'text/csv',
			buffer: Buffer.from('kind,name,price,currentA\nloads,Fan,12.50,3\nloads,Pump,1.005,2\n'),
		});
		const alert = b.page.getByRole('alert');
		await expect.poll(() => alert.textContent()).toMatch(/Row 3: price/);
		expect(await b.page.locator('tbody tr').count()).toBe(before);
		// The refusal is the one failed request the console saw.
		expect(b.problems).toEqual([
			'console: Failed to load resource: the server responded with a status of 400 (Bad Request)',
		]);
		b.problems.length = 0;
	});

	it('starts a bank from the shelf entry in a plan, and the plan’s parts to buy take its price', async () => {
		await b.page.setViewportSize({ width: 1366, height: 900 });
		const vehicleId = /\/vehicles\/([0-9a-f-]{36})/.exec(buildUrl)![1]!;
		const res = await b.page.request.fetch(
			`${appUrl}/api/teams/${teamId}/vehicles/${vehicleId}/plans`,
			{
				method: 'POST',
				headers: { Origin: appUrl, 'content-type': 'application/json' },
				data: JSON.stringify({ name: 'Second bank' }),
			},
		);
		expect(res.status()).toBe(201);
		const plan = (await res.json()) as { id: string };
		await b.page.goto(`${buildUrl}/plans/${plan.id}`);
		await b.page.waitForSelector('astro-island[component-export="PlanWorkspace"]:not([ssr])', {
			state: 'attached',
		});
		await b.page.locator('table[data-part-group="banks"]').waitFor();
		await b.page.getByRole('button', { name: '+ Add to battery banks' }).click();
		const form = b.page.getByRole('form', { name: 'Add a bank' });
		const pick = form.getByLabel('Start from the team’s shelf');
		await expect
			.poll(async () => (await pick.locator('option').allTextContents()).join('|'))
			.toMatch(/Garage AGM 1366 · 189\.90 each · 2 on hand/);
		await pick.selectOption({ label: 'Garage AGM 1366 · 189.90 each · 2 on hand' });
		await expect(form.getByLabel('Name').inputValue()).resolves.toBe('Garage AGM 1366');
		await form.getByRole('button', { name: 'Add the bank' }).click();
		await form.waitFor({ state: 'detached' });
		// The shelf's figures are the new bank's.
		await expect(b.page.getByLabel('Garage AGM 1366: Capacity/unit').inputValue()).resolves.toBe(
			'120',
		);
		// And its price is a line of the parts to buy.
		const parts = b.page.getByRole('table', { name: 'Parts list' });
		await expect.poll(() => parts.locator('input').first().inputValue()).toBe('Garage AGM 1366');
		await expect(parts.textContent()).resolves.toMatch(/189\.90/);
		await b.screenshot('shelf-plan-1366');
		expect(b.problems).toEqual([]);
	}, 60_000);

	it('prices a ranked change with the shelf entry that is its part, in dB per 100', async () => {
		const d = await openBrowser({ viewport: { width: 1366, height: 900 } });
		try {
			await openDemoVehicle(
				d,
				appUrl,
				DEMO_USERS[1].email,
				DEMO_PASSWORD,
				DEMO_TEAM_NAME,
				'Marlin',
			);
			const rear = marlinBuild.banks.find((x) => x.id === 'rear')!;
			const spare = DEMO_SHELF.find((x) => x.label === '100 Ah AGM, rear spare')!;
			const ranking = d.page.locator('[data-upgrades]');
			await ranking.locator('li').first().waitFor();
			const more = d.page.getByRole('button', { name: /Show all \d+ changes/ });
			if (await more.count()) await more.click();
			const line = ranking.locator('li[data-upgrade="add_bank"]').filter({ hasText: rear.label });
			// One battery per unit of the added string, at the shelf's price.
			await expect
				.poll(() => line.locator('[data-shelf-cost]').textContent())
				.toMatch(
					new RegExp(
						`^${minorToText(spare.priceMinor! * rear.unitsInSeries).replace('.', '\\.')} from the shelf( · \\d+\\.\\d\\d dB per 100)?$`,
					),
				);
			await d.screenshot('shelf-priced-upgrades-1366');
			expect(d.problems).toEqual([]);
		} finally {
			await d.close();
		}
	}, 60_000);
});
