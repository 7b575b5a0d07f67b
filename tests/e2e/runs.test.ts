import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, openVehicleRuns } from '../helpers/browser';
import { HAND_CSV } from '../helpers/logger-fixtures';

const appUrl = inject('appUrl');

describe('logging a run in chromium', () => {
	let b: Browser | undefined;
	afterAll(async () => b?.close());

	it('member logs a run with a logger file, sees the chart and the analysis, and the comparison gains the point', async () => {
		b = await openBrowser();
		const p = b.page;
		await openVehicleRuns(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME, 'Pebble');
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

	it('member fits the model to a logged run and starts a plan from the fitted values', async () => {
		await b?.close();
		b = await openBrowser();
		const p = b.page;
		await openVehicleRuns(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME, 'Marlin');
		// The demo's runs of this vehicle carry logger files; the first listed will do.
		await p.locator('table button').first().click();
		const section = p.getByRole('region', { name: 'Calibrate the model from this log' });
		// The demo logs rest below the regulator: taken as engine off, said so, and the default
		// choice is the banks' resistance and charge.
		await expect(
			section.getByLabel('Engine speed during the run (rpm)').inputValue(),
		).resolves.toBe('0');
		await expect(section.locator('[data-engine-guess]').textContent()).resolves.toMatch(
			/taken as engine off/,
		);
		await section.getByLabel('Engine speed during the run (rpm)').fill('');
		await expect(
			section.getByRole('button', { name: 'Fit the model to this log' }).isDisabled(),
		).resolves.toBe(true);
		await section.getByLabel('Engine speed during the run (rpm)').fill('0');
		await section.getByRole('button', { name: 'Fit the model to this log' }).click();
		const summary = section.getByText(/The model missed the log by/);
		await summary.waitFor();
		const [before, after] = [...((await summary.textContent()) ?? '').matchAll(/([\d.]+) V/g)].map(
			(m) => Number(m[1]),
		);
		// A least-squares fit that starts from the revision's values can only lower the error; the
		// demo's log is made from this revision, so the fit closes on it.
		expect(after!).toBeLessThanOrEqual(before!);
		expect(after!).toBeLessThan(0.05);
		const rows = section.getByRole('table', { name: 'Fitted values' }).getByRole('row');
		await expect(rows.count()).resolves.toBe(3);
		// Each value comes with its bounds.
		await expect(rows.nth(1).textContent()).resolves.toMatch(/±/);
		await expect(rows.nth(2).textContent()).resolves.toMatch(/±/);
		await section.getByRole('button', { name: 'Start a plan from these values' }).click();
		const link = section.getByRole('link', { name: /Open the plan/ });
		await link.waitFor();
		await b.screenshot('run-calibrated');
		await link.click();
		await p.waitForURL(/\/plans\//);
		await p
			.getByText(/Fitted to the run of/)
			.first()
			.waitFor();
		expect(b.problems).toEqual([]);
	});
});
