import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, SCREENSHOT_DIR, signInToTeam } from '../helpers/browser';

const appUrl = inject('appUrl');

describe('pre-event checklist in chromium', () => {
	let b: Browser | undefined;
	afterAll(async () => b?.close());

	it('a member opens the next event’s checks, signs off a manual item and prints the sheet to PDF', async () => {
		b = await openBrowser();
		const { page } = b;
		await signInToTeam(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
		await page.getByRole('link', { name: 'Events', exact: true }).click();
		await page.getByRole('link', { name: 'Pre-event checks' }).first().click();
		await page
			.getByRole('navigation', { name: 'Vehicles' })
			.getByRole('link', { name: 'Marlin' })
			.click();
		await page.waitForSelector('astro-island[component-export="ChecklistView"]:not([ssr])', {
			state: 'attached',
		});

		// The demo builds run their amplifier feeds past the drop target: that computed item fails.
		const status = page.getByRole('status').filter({ hasText: /computed item/ });
		await expect(status.textContent()).resolves.toMatch(/1 computed item fails/);
		const manual = page.getByRole('listitem').filter({ hasText: 'Battery hold-downs torqued' });
		await manual.getByRole('button', { name: 'Sign off' }).click();
		await manual.getByText(/Signed off by Demo Member/).waitFor();

		await page.emulateMedia({ media: 'print' });
		await expect(page.getByRole('button', { name: 'Sign off' }).first().isVisible()).resolves.toBe(
			false,
		);
		await expect(page.getByRole('button', { name: 'Print the sheet' }).isVisible()).resolves.toBe(
			false,
		);
		await b.screenshot('checklist-print');
		const pdf = await page.pdf({
			format: 'A4',
			printBackground: true,
			margin: { top: '12mm', bottom: '12mm', left: '12mm', right: '12mm' },
		});
		writeFileSync(path.join(SCREENSHOT_DIR, 'checklist.pdf'), pdf);
		expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
		expect(pdf.byteLength).toBeGreaterThan(10_000);
		expect(b.problems).toEqual([]);
	});
});
