import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, SCREENSHOT_DIR, signInToTeam } from '../helpers/browser';

const appUrl = inject('appUrl');

/** Signs a demo user in and opens Marlin's checklist for the first event listed. */
async function openMarlinChecks(b: Browser, email: string) {
	await signInToTeam(b, appUrl, email, DEMO_PASSWORD, DEMO_TEAM_NAME);
	await b.page.getByRole('link', { name: 'Events', exact: true }).click();
	await b.page.getByRole('link', { name: 'Pre-event checks' }).first().click();
	await b.page
		.getByRole('navigation', { name: 'Vehicles' })
		.getByRole('link', { name: 'Marlin' })
		.click();
	await b.page.waitForSelector('astro-island[component-export="ChecklistView"]:not([ssr])', {
		state: 'attached',
	});
}

describe('pre-event checklist in chromium', () => {
	let b: Browser | undefined;
	afterAll(async () => b?.close());

	it('a member opens the next event’s checks, signs off a manual item and prints the sheet to PDF', async () => {
		b = await openBrowser();
		const { page } = b;
		await openMarlinChecks(b, DEMO_USERS[1].email);

		// The demo builds run their amplifier feeds past the drop target: that computed item fails,
		// and a member cannot sign it off, only a captain can waive it.
		const status = page.locator('[data-banner]');
		await expect(status.textContent()).resolves.toMatch(/3 items still open/);
		const drops = page.locator('[data-item="drops"]');
		await drops.getByText('Needs a fix or a captain’s waiver').waitFor();
		await expect(drops.getByRole('button').count()).resolves.toBe(0);
		const manual = page.getByRole('listitem').filter({ hasText: 'Battery hold-downs torqued' });
		await manual.getByRole('button', { name: 'Sign off' }).click();
		await manual.getByText(/Signed off by Demo Member/).waitFor();
		// Signed, the manual item reads as signed off, no longer "to check".
		await expect(manual.textContent()).resolves.toMatch(/\(manual, signed off\)/);
		await expect(status.textContent()).resolves.toMatch(/2 items still open/);

		await page.emulateMedia({ media: 'print' });
		await expect(page.getByRole('button', { name: 'Sign off' }).first().isVisible()).resolves.toBe(
			false,
		);
		await expect(page.getByRole('button', { name: 'Print the sheet' }).isVisible()).resolves.toBe(
			false,
		);
		for (const field of ['Team', 'Vehicle', 'Class', 'Event', 'Date', 'Revision in force'])
			await expect(page.getByText(field, { exact: true }).isVisible()).resolves.toBe(true);
		await expect(page.getByText('Inspector’s signature').isVisible()).resolves.toBe(true);
		await b.screenshot('checklist-print');
		const pdf = await page.pdf({
			format: 'A4',
			printBackground: true,
			margin: { top: '12mm', bottom: '12mm', left: '12mm', right: '12mm' },
		});
		writeFileSync(path.join(SCREENSHOT_DIR, 'checklist.pdf'), pdf);
		expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
		expect(pdf.byteLength).toBeGreaterThan(10_000);
		// The demo's sheet fits one A4 page, signature lines and all.
		const pages = pdf.toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? [];
		expect(pages).toHaveLength(1);
		expect(b.problems).toEqual([]);
	});

	it('a captain waives the failing item with a reason, and the sheet shows it as waived', async () => {
		const c = await openBrowser();
		try {
			const { page } = c;
			await openMarlinChecks(c, DEMO_USERS[0].email);
			const drops = page.locator('[data-item="drops"]');
			await drops.getByRole('button', { name: 'Waive…' }).click();
			const reason = drops.getByLabel('Why the team accepts this failing item');
			await reason.fill('fine');
			await drops.getByRole('button', { name: 'Waive with this reason' }).click();
			await drops.getByText(/reason for the waiver/).waitFor();
			await reason.fill('Feed upsized before the finals; inspector told');
			await drops.getByRole('button', { name: 'Waive with this reason' }).click();
			await drops.getByText(/Waived by Demo Captain, .*Feed upsized before the finals/).waitFor();
			await expect(drops.textContent()).resolves.toMatch(/fails, waived/);
			const kit = page.getByRole('listitem').filter({ hasText: 'spare fuses in the kit' });
			await kit.getByRole('button', { name: 'Sign off' }).click();
			await kit.getByText(/Signed off by Demo Captain/).waitFor();
			await expect(page.locator('[data-banner]').textContent()).resolves.toMatch(
				/Every item passes, or is waived with a reason \(1 waived\)/,
			);
			await c.screenshot('checklist-waived');
			expect(c.problems).toEqual([]);
		} finally {
			await c.close();
		}
	});
});
