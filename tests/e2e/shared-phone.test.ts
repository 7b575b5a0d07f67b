import { afterAll, describe, expect, inject, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, signInToTeam, signUpWithTeam } from '../helpers/browser';

const appUrl = inject('appUrl');

/** What the service worker keeps for offline use, by cache: each entry's path and query. */
const keptCopies = (b: Browser) =>
	b.page.evaluate(async () => {
		const out: Record<string, string[]> = {};
		for (const name of ['sagwise-pages', 'sagwise-data']) {
			if (!(await caches.has(name))) continue;
			out[name] = (await (await caches.open(name)).keys()).map((r) => {
				const u = new URL(r.url);
				return u.pathname + u.search;
			});
		}
		return out;
	});

/** The drafts this browser holds (localStorage keys). */
const draftKeys = (b: Browser) =>
	b.page.evaluate(() =>
		Object.keys(window.localStorage).filter((k) => /^sagwise\.(plan-|comment-)?draft\./.test(k)),
	);

async function signOut(b: Browser) {
	await b.page.getByRole('button', { name: 'Sign out' }).click();
	await b.page.waitForURL(`${appUrl}/`);
}

/** A member of another team: a fresh account that makes its own team. */
const signUpRival = (b: Browser, email: string) =>
	signUpWithTeam(b, appUrl, {
		name: 'Rival Builder',
		email,
		password: 'a rival long password',
		team: 'Rival Crew',
	});

describe('a shared phone at the lanes, in chromium', () => {
	let b: Browser | undefined;
	afterAll(async () => b?.close());

	it('keeps nothing of one member for the next: kept copies, drafts and answers in flight at sign-out', async () => {
		b = await openBrowser({ viewport: { width: 390, height: 844 } });
		const p = b.page;
		await signInToTeam(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
		await p.evaluate(() => navigator.serviceWorker.ready.then(() => true));
		await p.getByRole('link', { name: 'Pebble', exact: true }).click();
		const buildUrl = p.url();
		const [, teamId, vehicleId] = /teams\/([^/]+)\/vehicles\/([^/]+)/.exec(buildUrl)!;
		const runsUrl = `${buildUrl}/runs`;
		await p.goto(runsUrl);
		await p.reload(); // through the service worker: kept for offline use
		await p.waitForSelector('astro-island[component-export="VehicleRuns"]:not([ssr])', {
			state: 'attached',
		});
		await expect
			.poll(async () => (await keptCopies(b!))['sagwise-pages'] ?? [])
			.toContain(new URL(runsUrl).pathname);

		// A comment half typed beside the newest run: kept under this member.
		await p.getByLabel('Add a comment').fill('Half-typed question for the captain');
		await expect.poll(() => draftKeys(b!)).toHaveLength(1);

		// An unsaved edit on the build page: kept under this member.
		await p.goto(buildUrl);
		await p.waitForSelector('astro-island[component-export="BuildWorkspace"]:not([ssr])', {
			state: 'attached',
		});
		await p.getByLabel('What changed and why').fill('Half-done edit by the member');
		await p.getByLabel('Front-to-rear run: Size').selectOption('awg:1/0');
		await expect.poll(() => draftKeys(b!)).toHaveLength(2);

		// An answer still in flight when the member signs out is not kept: the worker hears of the
		// sign-out first, then the answer (made for the member) arrives.
		const late = `/api/teams/${teamId}/runs?vehicleId=${vehicleId}&late=1`;
		const kept = await p.evaluate(async (url) => {
			const tell = (id: string | null) =>
				new Promise<void>((resolve) => {
					const channel = new MessageChannel();
					channel.port1.onmessage = () => resolve();
					navigator.serviceWorker.controller!.postMessage({ type: 'sagwise-user', id }, [
						channel.port2,
					]);
				});
			await tell(null);
			await (await fetch(url)).text();
			return Boolean(await (await caches.open('sagwise-data')).match(url));
		}, late);
		expect(kept).toBe(false);

		await signOut(b);
		await expect(draftKeys(b)).resolves.toEqual([]);
		await expect.poll(async () => Object.values(await keptCopies(b!)).flat()).toEqual([]);

		// A member of a rival team signs in on the same browser: offline, the first member's page
		// is not there to read, and neither is their draft.
		await signUpRival(b, `rival-${Date.now()}@sagwise.test`);
		await b.context.setOffline(true);
		const offline = await p.goto(runsUrl).catch(() => null);
		expect(offline === null || !offline.ok()).toBe(true);
		await b.context.setOffline(false);
		await p.goto(`${appUrl}/teams`);
		await expect(draftKeys(b)).resolves.toEqual([]);
		await b.screenshot('shared-phone-rival');
		// The failed offline navigation is the only problem seen.
		expect(b.problems.filter((x) => !x.includes(runsUrl))).toEqual([]);
	});

	it('on a phone at the event: today’s event chosen, key columns in view, offline kept at once and said, the notice gone once sent', async () => {
		const c = await openBrowser({ viewport: { width: 390, height: 844 } });
		try {
			const p = c.page;
			// A team of its own (a new captain), so the event made for today touches no other test.
			await signUpRival(c, `lanes-${Date.now()}@sagwise.test`);
			const teamId = /\/teams\/([0-9a-f-]{36})/.exec(p.url())![1]!;
			await p.evaluate(() => navigator.serviceWorker.ready.then(() => true));
			const post = async (path: string, data: unknown) => {
				const res = await p.request.post(`${appUrl}${path}`, { headers: { Origin: appUrl }, data });
				expect(res.status()).toBe(201);
				return (await res.json()) as { id: string };
			};
			// An event on the device's own today, and a vehicle with a build.
			const today = await p.evaluate(() => {
				const d = new Date();
				return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
			});
			const eventId = (
				await post(`/api/teams/${teamId}/events`, {
					name: 'Lanes today',
					startsOn: today,
					endsOn: today,
					place: 'Pier lot',
					format: 'SPL',
				})
			).id;
			const vehicleId = (await post(`/api/teams/${teamId}/vehicles`, { name: 'Lane car' })).id;
			await post(`/api/teams/${teamId}/vehicles/${vehicleId}/revisions`, {
				parentId: null,
				message: 'As built',
				document: pebbleBuild,
			});
			const runsUrl = `${appUrl}/teams/${teamId}/vehicles/${vehicleId}/runs`;
			await p.goto(runsUrl);
			await p.reload();
			await p.waitForSelector('astro-island[component-export="VehicleRuns"]:not([ssr])', {
				state: 'attached',
			});
			await expect.poll(() => p.locator('#run-event').inputValue()).toBe(eventId);

			// The key columns of the tables stay within the 390 px screen.
			const within = async (locator: ReturnType<typeof p.locator>) => {
				const box = await locator.boundingBox();
				return box !== null && box.x >= 0 && box.x + box.width <= 390;
			};
			const logButton = p.getByRole('button', { name: 'Log the run' });
			const lb = (await logButton.boundingBox())!;
			expect(lb.height).toBeLessThan(48); // one line

			// Offline: the banner says the page is a kept copy, and the run is kept at once.
			await c.context.setOffline(true);
			await p.locator('#offline-banner').waitFor();
			await expect(p.locator('#offline-banner').textContent()).resolves.toMatch(
				/No connection: this is the copy of this page from/,
			);
			await p.getByLabel('Score (dB)').fill('147.4');
			const started = Date.now();
			await logButton.click();
			await p.getByText(/No connection: the run is kept on this device/).waitFor();
			expect(Date.now() - started).toBeLessThan(1500);
			await c.screenshot('phone-offline-kept');
			await c.context.setOffline(false);
			await p.getByText('The run kept on this device has been sent.').waitFor({ timeout: 30_000 });
			await expect(p.getByText(/No connection: the run is kept/).count()).resolves.toBe(0);
			await expect(p.locator('#offline-banner').isHidden()).resolves.toBe(true);
			// The runs table, once it has the run, keeps its score and minimum within the screen.
			const runs = p.getByRole('table').first();
			await runs.getByRole('cell', { name: /147\.4/ }).waitFor();
			await expect(within(runs.getByRole('columnheader', { name: 'Score' }))).resolves.toBe(true);
			await expect(within(runs.getByRole('columnheader', { name: 'Minimum' }))).resolves.toBe(true);
			await c.screenshot('phone-runs');

			// The day on one screen: today's event, the checks open, the way to log, the last scores.
			await p.goto(`${appUrl}/teams/${teamId}/day`);
			await p.getByRole('heading', { name: 'Today: Lanes today' }).waitFor();
			const card = p.locator(`[data-day-vehicle="${vehicleId}"]`);
			await expect(card.getByRole('link', { name: 'Log a run' }).isVisible()).resolves.toBe(true);
			await expect(
				card.getByRole('link', { name: /checks open|checks done/ }).count(),
			).resolves.toBe(1);
			await expect(card.textContent()).resolves.toMatch(/147\.4 dB/);
			// The vehicle this member last logged for on this phone comes first, marked.
			await expect(card.locator('[data-last-used]').isVisible()).resolves.toBe(true);
			const cardBox = (await card.boundingBox())!;
			expect(cardBox.y + cardBox.height).toBeLessThanOrEqual(844);
			await c.screenshot('phone-day');

			expect(c.problems.filter((x) => !/ERR_INTERNET_DISCONNECTED/.test(x))).toEqual([]);

			// The demo captain's members table and plans list keep role and Remove, and cost, in view.
			const d = await openBrowser({ viewport: { width: 390, height: 844 } });
			try {
				await signInToTeam(d, appUrl, DEMO_USERS[0].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
				await d.page.waitForURL(/\/teams\/[0-9a-f-]{36}/);
				const demoTeam = /\/teams\/([0-9a-f-]{36})/.exec(d.page.url())![1]!;
				await d.page.getByRole('link', { name: 'Old Oak', exact: true }).click();
				const plansUrl = `${d.page.url()}/plans`;
				await d.page.goto(`${appUrl}/teams/${demoTeam}/settings`);
				const memberRow = d.page.getByRole('row').filter({ hasText: 'Demo Member' });
				await memberRow.getByRole('combobox').waitFor();
				const inView = async (l: ReturnType<typeof d.page.locator>) => {
					const box = await l.boundingBox();
					return box !== null && box.x >= 0 && box.x + box.width <= 390;
				};
				await expect(inView(memberRow.getByRole('combobox'))).resolves.toBe(true);
				await expect(inView(memberRow.getByRole('button', { name: 'Remove' }))).resolves.toBe(true);
				await d.screenshot('phone-members');
				await d.page.goto(plansUrl);
				const costHeader = d.page.getByRole('columnheader', { name: 'Cost' });
				await costHeader.waitFor();
				await expect(inView(costHeader)).resolves.toBe(true);
				expect(d.problems).toEqual([]);
			} finally {
				await d.close();
			}
		} finally {
			await c.close();
		}
	});

	it('sends a waiting run only with its author’s session: another member signed in elsewhere sees whose it is', async () => {
		const a = await openBrowser({ viewport: { width: 390, height: 844 } });
		try {
			const p = a.page;
			await signInToTeam(a, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
			await p.evaluate(() => navigator.serviceWorker.ready.then(() => true));
			await p.getByRole('link', { name: 'Old Oak', exact: true }).click();
			const runsUrl = `${p.url()}/runs`;
			const [, teamId, vehicleId] = /teams\/([^/]+)\/vehicles\/([^/]+)/.exec(runsUrl)!;
			await p.goto(runsUrl);
			await p.reload();
			await p.waitForSelector('astro-island[component-export="VehicleRuns"]:not([ssr])', {
				state: 'attached',
			});
			// What the page asks for as it opens has come back before the signal goes.
			await p.waitForLoadState('networkidle');
			const serverRuns = async () =>
				(
					(await (
						await a.context.request.get(`${appUrl}/api/teams/${teamId}/runs?vehicleId=${vehicleId}`)
					).json()) as unknown[]
				).length;
			const before = await serverRuns();

			// Logged with no signal: kept on the phone.
			await a.context.setOffline(true);
			await p.getByLabel('Score (dB)').fill('151.2');
			await p.getByRole('button', { name: 'Log the run' }).click();
			await p.getByText(/No connection: the run is kept on this device/).waitFor();
			const outbox = p.getByRole('region', { name: 'Runs waiting to be sent' });
			await expect(outbox.getByText('not yet sent').count()).resolves.toBe(1);

			// The connection returns, but this tab's run posts still fail (a dead spot at the lanes):
			// the run waits while, in a second tab, the member signs out and the captain signs in.
			const runPosts = /\/api\/teams\/[^/]+\/runs$/;
			await p.route(runPosts, (route) => route.abort('internetdisconnected'));
			await a.context.setOffline(false);
			const second = await a.context.newPage();
			await second.goto(`${appUrl}/teams`);
			await second.getByRole('button', { name: 'Sign out' }).click();
			await second.waitForURL(`${appUrl}/`);
			await second.goto(`${appUrl}/sign-in?callbackUrl=/teams`);
			await second.getByLabel('E-mail').fill(DEMO_USERS[0].email);
			await second.getByLabel('Password').fill(DEMO_PASSWORD);
			await second.getByRole('button', { name: 'Sign in' }).click();
			await second.waitForURL(`${appUrl}/teams`);

			// The first tab tries to send: the live session is the captain's, so the run waits.
			await p.unroute(runPosts);
			await outbox.getByRole('button', { name: 'Try sending now' }).click();
			await p.locator('[data-session-changed]').waitFor();
			await expect(outbox.getByText('not yet sent').count()).resolves.toBe(1);
			expect(await serverRuns()).toBe(before);

			// The captain's own view of the runs page says whose run waits, and sends nothing.
			await second.goto(runsUrl);
			await second.waitForSelector('astro-island[component-export="VehicleRuns"]:not([ssr])', {
				state: 'attached',
			});
			await expect(second.locator('[data-others-waiting]').textContent()).resolves.toMatch(
				/1 entry by Demo Member/,
			);
			await expect(
				second.getByRole('region', { name: 'Runs waiting to be sent' }).count(),
			).resolves.toBe(0);
			expect(await serverRuns()).toBe(before);
			await second.close();
			// The dead spot's refused requests are the only problems seen.
			expect(a.problems.filter((x) => !/ERR_INTERNET_DISCONNECTED/.test(x))).toEqual([]);
		} finally {
			await a.close();
		}
	});
});
