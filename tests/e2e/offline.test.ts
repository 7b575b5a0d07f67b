import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, signInToTeam } from '../helpers/browser';
import { HAND_CSV } from '../helpers/logger-fixtures';

const appUrl = inject('appUrl');

interface Run {
	id: string;
	notes: string;
	hasLogger: boolean;
	ranAt: string;
	ranAtOffsetMin: number | null;
	scoreDb: number | null;
}

describe('logging at the lanes with no signal, in chromium', () => {
	let b: Browser | undefined;
	afterAll(async () => b?.close());

	it('a member logs a run and signs off a check offline; both wait on the phone, marked, and arrive exactly once when the connection returns', async () => {
		// A browser in a zone other than the server's: the run keeps its instant and its offset.
		b = await openBrowser({ viewport: { width: 390, height: 844 }, timezoneId: 'America/Denver' });
		const p = b.page;
		await signInToTeam(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
		await p.evaluate(() => navigator.serviceWorker.ready.then(() => true));
		await p.getByRole('link', { name: 'Pebble', exact: true }).click();
		await p.getByRole('link', { name: 'Runs', exact: true }).click();
		const runsUrl = p.url();
		const [, teamId, vehicleId] = /teams\/([^/]+)\/vehicles\/([^/]+)\/runs/.exec(runsUrl)!;
		// Opened once online (through the service worker), the page is kept for later.
		await p.reload();
		await p.waitForSelector('astro-island[component-export="VehicleRuns"]:not([ssr])', {
			state: 'attached',
		});
		// The checks sheet of the next event, opened once too.
		await p.goto(`${appUrl}/teams/${teamId}/events`);
		const checksHref = await p
			.getByRole('link', { name: 'Pre-event checks' })
			.last()
			.getAttribute('href');
		const checksUrl = new URL(`${checksHref!.split('?')[0]}?vehicleId=${vehicleId}`, appUrl).href;
		await p.goto(checksUrl);
		await p.waitForSelector('astro-island[component-export="ChecklistView"]:not([ssr])', {
			state: 'attached',
		});

		const serverRuns = async () =>
			(await (
				await b!.context.request.get(`${appUrl}/api/teams/${teamId}/runs?vehicleId=${vehicleId}`)
			).json()) as Run[];
		const before = (await serverRuns()).length;

		await b.context.setOffline(true);
		const fromCache = await p.goto(runsUrl);
		expect(fromCache?.fromServiceWorker()).toBe(true);
		await p.waitForSelector('astro-island[component-export="VehicleRuns"]:not([ssr])', {
			state: 'attached',
		});
		const dir = mkdtempSync(path.join(tmpdir(), 'sagwise-offline-'));
		const file = path.join(dir, 'lanes.csv');
		writeFileSync(file, HAND_CSV);
		await p.getByLabel('Score (dB)').fill('139.9');
		await p.getByLabel('Minimum voltage (V)').fill('12.2');
		await p.getByLabel('Notes').fill('Logged offline at the lanes');
		await p.getByLabel(/Logger file/).setInputFiles(file);
		await p.getByRole('button', { name: 'Log the run' }).click();
		await p.getByText(/No connection: the run is kept on this device/).waitFor();
		const outbox = p.getByRole('region', { name: 'Runs waiting to be sent' });
		await expect(outbox.getByText('not yet sent').count()).resolves.toBe(1);
		await expect(p.getByLabel('Score (dB)').inputValue()).resolves.toBe('');

		// Kept on the device across a reload; a second tab holds the same entry.
		await p.reload();
		await outbox
			.getByText(/Run of .* · 139\.9 dB · min 12\.20 V · logger file lanes\.csv/)
			.waitFor();
		const second = await b.context.newPage();
		await second.goto(runsUrl);
		await second
			.getByRole('region', { name: 'Runs waiting to be sent' })
			.getByText('not yet sent')
			.waitFor();

		// A sign-off made offline on the sheet opened before.
		await p.goto(checksUrl);
		await p.waitForSelector('astro-island[component-export="ChecklistView"]:not([ssr])', {
			state: 'attached',
		});
		const kit = p.locator('[data-item^="manual:"]').filter({ hasText: 'spare fuses in the kit' });
		await kit.getByRole('button', { name: 'Sign off' }).click();
		await kit.getByText('Signed off on this device, not yet sent').waitFor();
		await b.screenshot('offline-checks');
		expect((await serverRuns()).length).toBe(before);

		await b.context.setOffline(false);
		await p
			.getByRole('region', { name: 'Sign-offs waiting to be sent' })
			.waitFor({ state: 'detached', timeout: 30_000 });
		await kit.getByText(/Signed off by Demo Member/).waitFor();
		await second.bringToFront();
		await second
			.getByRole('region', { name: 'Runs waiting to be sent' })
			.waitFor({ state: 'detached', timeout: 30_000 });

		const after = await serverRuns();
		const arrived = after.filter((r) => r.notes === 'Logged offline at the lanes');
		expect(after.length).toBe(before + 1);
		expect(arrived).toHaveLength(1);
		expect(arrived[0]).toMatchObject({ scoreDb: 139.9, hasLogger: true });
		// Denver in December is UTC−7, and the instant is the one the phone saw.
		expect(arrived[0]!.ranAtOffsetMin).toBe(-420);
		expect(Math.abs(Date.parse(arrived[0]!.ranAt) - Date.now())).toBeLessThan(10 * 60_000);
		await b.screenshot('offline-arrived');
		expect(
			b.problems.filter((x) => !/ERR_INTERNET_DISCONNECTED|Failed to fetch|net::ERR_/.test(x)),
		).toEqual([]);
	});
});
