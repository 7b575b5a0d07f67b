import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, signInToTeam } from '../helpers/browser';
import { HAND_CSV } from '../helpers/logger-fixtures';

const appUrl = inject('appUrl');

describe('logging a run in chromium', () => {
	let b: Browser | undefined;
	afterAll(async () => b?.close());

	it('member logs a run with a logger file, sees the chart and the analysis, and the comparison gains the point', async () => {
		b = await openBrowser();
		const p = b.page;
		await signInToTeam(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
		await p.getByRole('link', { name: 'Pebble', exact: true }).click();
		await p.getByRole('link', { name: 'Runs', exact: true }).click();
		await p.waitForSelector('astro-island[component-export="VehicleRuns"]:not([ssr])', {
			state: 'attached',
		});
		const chart = p.getByTestId('score-vs-voltage');
		const before = Number(await chart.getAttribute('data-points'));

		const dir = mkdtempSync(path.join(tmpdir(), 'sagwise-logger-'));
		const file = path.join(dir, 'burp.csv');
		writeFileSync(file, HAND_CSV);
		await p.getByLabel('Score (dB)').fill('141.2');
		await p.getByLabel('Resting voltage (V)').fill('12.6');
		await p.getByLabel('Minimum voltage (V)').fill('12.2');
		await p.getByLabel('Notes').fill('First run with the logger');
		await p.getByLabel(/Logger file/).setInputFiles(file);
		await expect(p.getByLabel('Volts column').inputValue()).resolves.toBe('volts');
		await p.getByRole('button', { name: 'Log the run' }).click();
		// Another browser test may add a revision to this vehicle meanwhile, so any revision number will do.
		await p.getByText(/Run logged against revision r\d+\./).waitFor();

		const analysis = p.getByLabel('Analysis of the logger file');
		await analysis.waitFor();
		// The hand computation of the four-sample file: 12.2 V minimum, 200 A peak, 1.19 Wh, 2.00 mΩ.
		await expect(analysis.textContent()).resolves.toMatch(
			/12\.20 V.*200 A.*1\.19 Wh.*2\.00 mΩ.*12\.60 V/s,
		);
		await expect(
			p.getByRole('img', { name: 'Voltage and current over the run' }).count(),
		).resolves.toBe(1);
		await expect.poll(async () => Number(await chart.getAttribute('data-points'))).toBe(before + 1);
		await b.screenshot('run-logged');
		expect(b.problems).toEqual([]);
	});
});
