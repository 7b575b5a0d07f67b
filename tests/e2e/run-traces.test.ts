import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, openVehicleRuns } from '../helpers/browser';

const appUrl = inject('appUrl');

describe('runs compared trace by trace in chromium', () => {
	let b: Browser | undefined;
	afterAll(async () => b?.close());

	it('a member compares four runs of two vehicles: traces aligned at the burp, measurements, revision changes and dB against the volts', async () => {
		b = await openBrowser();
		const p = b.page;
		await openVehicleRuns(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME, 'Marlin');
		const table = p.getByRole('table').first();
		// The demo's Marlin runs: May (logger), June (no logger), September (logger).
		for (const day of ['16 May 2026', '20 Jun 2026', '19 Sep 2026'])
			await table
				.getByRole('row')
				.filter({ hasText: day })
				.getByRole('checkbox', { name: /to the comparison/ })
				.check();
		const section = p.getByRole('region', { name: 'Compare runs trace by trace' });
		const add = section.getByLabel('Add a run');
		const oak = await add
			.locator('option', { hasText: /Old Oak · 20 Jun 2026/ })
			.getAttribute('value');
		await add.selectOption(oak!);

		const compared = section.getByRole('list', { name: 'Runs compared' }).getByRole('listitem');
		await expect(compared.count()).resolves.toBe(4);
		await expect(section.getByLabel('Add a run').isDisabled()).resolves.toBe(true);
		const chart = section.getByTestId('trace-chart');
		await chart.waitFor();
		await expect(chart.getAttribute('data-traces')).resolves.toBe('3');
		// Each trace's start is found from its current rise: the demo loggers start 1.35 s and 0.45 s
		// before their burps and the current ramps to its peak over 0.5 s, so the halfway crossing
		// sits about a quarter second after the lead.
		await expect(compared.nth(0).textContent()).resolves.toMatch(/Start 1\.[56]\d s/);
		await expect(compared.nth(2).textContent()).resolves.toMatch(/Start 0\.[67]\d s/);
		await expect(compared.nth(1).textContent()).resolves.toMatch(/no logger file/);

		await expect(section.textContent()).resolves.toMatch(
			/D: Old Oak is another vehicle: its build is compared as a whole\./,
		);
		await section.getByText(/^B: /).waitFor();
		const volts = section.getByRole('table', { name: 'Did the volts turn into score?' });
		await expect(volts.getByRole('row').count()).resolves.toBe(4);
		// C against A from the logger files' minima (not the typed 11.7 and 11.9 V): 20·log10(11.307 /
		// 11.855) = −0.41 dB from the volts; 148.3 − 147.9 = +0.40 dB measured; +0.81 dB between them.
		await expect(volts.getByRole('row', { name: /C against A/ }).textContent()).resolves.toMatch(
			/[−-]0\.41 dB.*\+0\.40 dB.*\+0\.81 dB/,
		);

		await section.getByLabel('Move run C’s start (s)').fill('0.2');
		await expect(chart.getAttribute('data-traces')).resolves.toBe('3');
		await section.getByRole('button', { name: 'Remove D' }).click();
		await expect(compared.count()).resolves.toBe(3);
		await expect(section.getByLabel('Add a run').isDisabled()).resolves.toBe(false);
		await b.screenshot('run-traces');
		expect(b.problems).toEqual([]);
	});
});
