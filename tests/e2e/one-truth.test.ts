import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type BuildReport, headlineFigures } from '../../src/engine';
import type { BuildDocument } from '../../src/engine/types';
import { fmt } from '../../src/lib/format';
import { type Browser, openBrowser, signInToTeam, signUpWithTeam } from '../helpers/browser';
import { randomNetwork, withUnfusedBank } from '../helpers/networks';

const appUrl = inject('appUrl');
type Ok = Extract<BuildReport, { ok: true }>;

/** A JSON call from the signed-in page's own session (the Origin header as a browser sends it). */
async function api<T>(b: Browser, method: 'GET' | 'POST' | 'PUT', path: string, data?: unknown) {
	const res = await b.page.request.fetch(`${appUrl}${path}`, {
		method,
		headers: { Origin: appUrl, 'content-type': 'application/json' },
		...(data === undefined ? {} : { data: JSON.stringify(data) }),
	});
	return { status: res.status(), body: (await res.json().catch(() => null)) as T };
}

const teamIdOf = (b: Browser) => /\/teams\/([0-9a-f-]{36})/.exec(b.page.url())![1]!;

/** A vehicle of the team with one revision holding `document`. */
async function vehicleWith(b: Browser, teamId: string, name: string, document: BuildDocument) {
	const v = await api<{ id: string }>(b, 'POST', `/api/teams/${teamId}/vehicles`, { name });
	expect(v.status).toBe(201);
	const r = await api<{ id: string; number: number }>(
		b,
		'POST',
		`/api/teams/${teamId}/vehicles/${v.body.id}/revisions`,
		{ parentId: null, message: 'Drawn for the check', document },
	);
	expect(r.status).toBe(201);
	return { vehicleId: v.body.id, revisionId: r.body.id };
}

/**
 * The strip's figures as shown in an HTML text (the served page) or, with no text, in the live
 * page: the text of each `data-figure` cell's value line, read by the browser's own parser.
 */
function stripTexts(b: Browser, html?: string): Promise<Record<string, string>> {
	return b.page.evaluate((source) => {
		const root = source ? new DOMParser().parseFromString(source, 'text/html') : document;
		const out: Record<string, string> = {};
		for (const cell of root.querySelectorAll('[data-summary] [data-figure]')) {
			const value = cell.querySelectorAll('p')[1];
			out[cell.getAttribute('data-figure')!] = (value?.textContent ?? '')
				.replace(/\s+/g, ' ')
				.trim();
		}
		return out;
	}, html ?? null);
}

/** The text of a team page's card for a vehicle (its link's nearest list item or section). */
function teamCardText(b: Browser, html: string, href: string): Promise<string> {
	return b.page.evaluate(
		([source, link]) => {
			const doc = new DOMParser().parseFromString(source, 'text/html');
			const a = doc.querySelector(`a[href="${link}"]`);
			const card = a?.closest('li, article, section');
			return (card?.textContent ?? '').replace(/\s+/g, ' ');
		},
		[html, href] as const,
	);
}

/** What the strip must read for a report: the engine's headline figures, formatted as shown. */
function expectedStrip(report: Ok): Record<string, string> {
	const h = headlineFigures(report);
	const v = (x: number | null) => (h.collapse ? 'collapse' : x === null ? '—' : `${fmt(x)} V`);
	return {
		settle: v(h.settleV),
		lowest: v(h.lowestAmpV),
		loss: `${fmt(h.worstLossDb)} dB`,
		alt: `${fmt(h.alternatorShare * 100, 0)} %`,
		bank: `${fmt(Math.abs(h.bankCurrentA), 0)} A ${h.bankCurrentA > 0.5 ? 'out' : 'in'}`,
		cable: `${fmt(h.cableLossW, 0)} W`,
		findings: `${h.findings.danger} danger · ${h.findings.warning} warn`,
	};
}

describe('one truth per figure, in chromium', () => {
	/** The demo captain, who only reads the demo team here. */
	let captain: Browser;
	/** A captain of a team of its own, where the vehicles these tests make and change live. */
	let own: Browser;
	let teamId: string;
	let ownTeamId: string;
	beforeAll(async () => {
		captain = await openBrowser();
		await signInToTeam(captain, appUrl, DEMO_USERS[0].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
		await captain.page.waitForURL(/\/teams\/[0-9a-f-]{36}/);
		teamId = teamIdOf(captain);
		own = await openBrowser();
		await signUpWithTeam(own, appUrl, {
			name: 'Truth Captain',
			email: `truth-${Date.now()}@sagwise.test`,
			password: 'a truth long password',
			team: 'Truth Test Crew',
		});
		ownTeamId = teamIdOf(own);
	});
	afterAll(async () => {
		await captain?.close();
		await own?.close();
	});

	it('reads each headline figure the same from the API, the served page, the live strip, the findings list, the inspector and the team page', async () => {
		const vehicles = (
			await api<{ id: string; name: string }[]>(captain, 'GET', `/api/teams/${teamId}/vehicles`)
		).body;
		const generated = await vehicleWith(own, ownTeamId, 'Generated network 7', randomNetwork(7));
		const cases: { who: Browser; team: string; vehicleId: string }[] = [
			...['Pebble', 'Marlin', 'Old Oak'].map((n) => ({
				who: captain,
				team: teamId,
				vehicleId: vehicles.find((v) => v.name === n)!.id,
			})),
			{ who: own, team: ownTeamId, vehicleId: generated.vehicleId },
		];
		for (const { who, team: teamId, vehicleId } of cases) {
			const page = who.page;
			const teamHtml = await (await page.request.get(`${appUrl}/teams/${teamId}`)).text();
			const revisions = (
				await api<{ id: string; number: number }[]>(
					who,
					'GET',
					`/api/teams/${teamId}/vehicles/${vehicleId}/revisions`,
				)
			).body;
			const head = revisions.reduce((a, r) => (r.number > a.number ? r : a));
			const fromApi = await api<{ report: Ok }>(
				who,
				'GET',
				`/api/teams/${teamId}/vehicles/${vehicleId}/revisions/${head.id}/report`,
			);
			expect(fromApi.status).toBe(200);
			const expected = expectedStrip(fromApi.body.report);

			// The page as the server sends it, before any script runs.
			const url = `${appUrl}/teams/${teamId}/vehicles/${vehicleId}`;
			const served = await (await page.request.get(url)).text();
			await expect(stripTexts(who, served), `served page of ${vehicleId}`).resolves.toEqual(
				expected,
			);

			// The live strip once the island has computed in the browser.
			await page.goto(url);
			await page.waitForSelector('astro-island[component-export="BuildWorkspace"]:not([ssr])', {
				state: 'attached',
			});
			await page.locator('[data-findings], [data-summary]').first().waitFor();
			await expect(stripTexts(who), `live strip of ${vehicleId}`).resolves.toEqual(expected);
			// The findings list counts what the strip counts.
			const h = headlineFigures(fromApi.body.report);
			if (h.findings.danger + h.findings.warning > 0)
				await expect(page.locator('[data-findings]').getAttribute('data-findings')).resolves.toBe(
					`${h.findings.danger}|${h.findings.warning}`,
				);
			// The inspector of the lowest amplifier gives the strip's lowest voltage.
			const report = fromApi.body.report;
			if (!h.collapse && report.amplifiers.length) {
				const lowest = report.amplifiers.reduce((a, x) =>
					x.burpTerminalV < a.burpTerminalV ? x : a,
				);
				// Its button in the part lists (a finding on it adds a mark before the name).
				const name = new RegExp(`${lowest.label.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}$`);
				await page
					.getByRole('navigation', { name: 'Parts of the build' })
					.getByRole('button', { name })
					.first()
					.click();
				const inspector = page.locator('[data-inspector]');
				await inspector.waitFor();
				const row = inspector.locator('div', { has: page.getByText('Terminal voltage, burp') });
				await expect(row.locator('dd').first().textContent()).resolves.toBe(expected.lowest);
				await inspector.getByRole('button', { name: 'Close' }).click();
			}
			// The team page's card for the vehicle.
			const text = await teamCardText(who, teamHtml, `/teams/${teamId}/vehicles/${vehicleId}`);
			expect(text).toContain(`Settles at, burp${expected.settle}`);
			expect(text).toContain(`Lowest amplifier, burp${expected.lowest}`);
			expect(text).toContain(`${h.findings.danger} danger ${h.findings.warning} warning`);
		}
		expect(captain.problems).toEqual([]);
		expect(own.problems).toEqual([]);
	});

	it('re-opens a captain’s waiver when a later revision makes the item worse', async () => {
		// Pebble's front-to-rear run made twice as long: the drop target fails (by Ohm's law the run's
		// drop doubles); three times as long, it fails worse.
		const longer = (k: number) => {
			const d = structuredClone(pebbleBuild);
			d.cables.find((c) => c.id === 'run')!.lengthM *= k;
			return d;
		};
		const { vehicleId, revisionId } = await vehicleWith(
			own,
			ownTeamId,
			'Waiver test car',
			longer(2),
		);
		const tomorrow = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
		const event = await api(own, 'POST', `/api/teams/${ownTeamId}/events`, {
			name: 'Next meet',
			startsOn: tomorrow,
			endsOn: tomorrow,
			place: '',
			format: '',
		});
		expect(event.status).toBe(201);
		const { page } = own;
		await page.goto(`${appUrl}/teams/${ownTeamId}/events`);
		await page.getByRole('link', { name: 'Pre-event checks' }).first().click();
		await page
			.getByRole('navigation', { name: 'Vehicles' })
			.getByRole('link', { name: 'Waiver test car' })
			.click();
		await page.waitForSelector('astro-island[component-export="ChecklistView"]:not([ssr])', {
			state: 'attached',
		});
		const drops = page.locator('[data-item="drops"]');
		await drops.getByRole('button', { name: 'Waive…' }).click();
		await drops
			.getByLabel('Why the team accepts this failing item')
			.fill('Run shortened after this event; inspector agreed');
		await drops.getByRole('button', { name: 'Waive with this reason' }).click();
		await drops.getByText(/Waived by Truth Captain, .* on r1\./).waitFor();
		await expect(drops.textContent()).resolves.toMatch(/fails, waived/);

		// A later revision with the run longer still.
		const worse = await api<{ number: number }>(
			own,
			'POST',
			`/api/teams/${ownTeamId}/vehicles/${vehicleId}/revisions`,
			{ parentId: revisionId, message: 'Run rerouted the long way', document: longer(3) },
		);
		expect(worse.status).toBe(201);
		await page.reload();
		await page.waitForSelector('astro-island[component-export="ChecklistView"]:not([ssr])', {
			state: 'attached',
		});
		const reopened = page.locator('[data-item="drops"] [data-reopened]');
		await expect(reopened.textContent()).resolves.toMatch(
			/Waived on r1 at \d+\.\d\d V; now \d+\.\d\d V: open again/,
		);
		await expect(page.locator('[data-item="drops"]').textContent()).resolves.toMatch(
			/worse than waived/,
		);
		await expect(page.locator('[data-banner]').getAttribute('data-banner')).resolves.toBe('open');
		await own.screenshot('checks-waiver-reopened');
		expect(own.problems).toEqual([]);
	});

	it('names a danger finding a plan brings in the comparison, withholds the best-value mark, and asks before installing', async () => {
		const { vehicleId } = await vehicleWith(own, ownTeamId, 'Plan danger car', pebbleBuild);
		const created = await api<{ id: string; version: number; document: BuildDocument }>(
			own,
			'POST',
			`/api/teams/${ownTeamId}/vehicles/${vehicleId}/plans`,
			{ name: 'Second bank, no fuse' },
		);
		expect(created.status).toBe(201);
		const d = withUnfusedBank(created.body.document);
		const saved = await api(
			own,
			'PUT',
			`/api/teams/${ownTeamId}/vehicles/${vehicleId}/plans/${created.body.id}`,
			{
				version: created.body.version,
				name: 'Second bank, no fuse',
				notes: '',
				document: d,
				parts: [{ item: 'AGM battery', quantity: 1, unitPrice: 1 }],
			},
		);
		expect(saved.status).toBe(200);
		const { page } = own;
		await page.goto(
			`${appUrl}/teams/${ownTeamId}/vehicles/${vehicleId}/plans?compare=${created.body.id}`,
		);
		const dangers = page.locator(`[data-findings="${created.body.id}"] [data-added-dangers]`);
		await dangers.waitFor();
		await expect(dangers.textContent()).resolves.toMatch(/Extra bank link/);
		await expect(page.getByText('★ most dB for the money').count()).resolves.toBe(0);

		const questions: string[] = [];
		page.on('dialog', (dialog) => {
			questions.push(dialog.message());
			void dialog.dismiss();
		});
		await page.getByRole('button', { name: 'Install as next revision' }).click();
		await expect.poll(() => questions.length).toBe(1);
		expect(questions[0]).toMatch(/brings a safety finding|brings \d+ safety findings/);
		expect(questions[0]).toMatch(/Extra bank link/);
		// Dismissed: nothing installed.
		const revisions = await api<unknown[]>(
			own,
			'GET',
			`/api/teams/${ownTeamId}/vehicles/${vehicleId}/revisions`,
		);
		expect(revisions.body).toHaveLength(1);
		await own.screenshot('comparison-danger-named');
		expect(own.problems).toEqual([]);
	});

	it('a saved plan reads as saved, also after a reload', async () => {
		const { vehicleId } = await vehicleWith(own, ownTeamId, 'Plan save car', pebbleBuild);
		const created = await api<{ id: string }>(
			own,
			'POST',
			`/api/teams/${ownTeamId}/vehicles/${vehicleId}/plans`,
			{ name: 'Bigger run' },
		);
		const { page } = own;
		const planUrl = `${appUrl}/teams/${ownTeamId}/vehicles/${vehicleId}/plans/${created.body.id}`;
		// The server sends the plan page without working out its figures (no engine work on its
		// request thread); the browser works them out once the page is live.
		const served = await (await page.request.get(planUrl)).text();
		expect(served).toContain('Working out the figures');
		expect(served).not.toContain('data-summary');
		await page.goto(planUrl);
		await page.waitForSelector('astro-island[component-export="PlanWorkspace"]:not([ssr])', {
			state: 'attached',
		});
		await page.locator('[data-summary]').waitFor();
		await page.getByLabel('Plan name').fill('Bigger run, 1/0');
		await page.getByText('● unsaved').waitFor();
		await page.getByRole('button', { name: 'Save plan' }).click();
		await page.getByText('Plan saved.').waitFor();
		await expect(page.getByText('● unsaved').count()).resolves.toBe(0);
		await page.reload();
		await page.waitForSelector('astro-island[component-export="PlanWorkspace"]:not([ssr])', {
			state: 'attached',
		});
		await expect(page.getByLabel('Plan name').inputValue()).resolves.toBe('Bigger run, 1/0');
		await expect(page.getByText('● unsaved').count()).resolves.toBe(0);
		await expect(page.getByText(/unsaved changes .* are back/).count()).resolves.toBe(0);
		expect(own.problems).toEqual([]);
	});

	it('the new-event form keeps what was typed while its dates are set from the keyboard', async () => {
		const { page } = own;
		await page.goto(`${appUrl}/teams/${ownTeamId}/events`);
		const form = page.getByRole('form', { name: 'Add an event' });
		await form.scrollIntoViewIfNeeded();
		await page.waitForSelector('astro-island[component-export="NewEventForm"]:not([ssr])', {
			state: 'attached',
		});
		await form.getByLabel('Event').click();
		await page.keyboard.type('Harbour practice day');
		await page.keyboard.press('Tab');
		// Chromium's date field, en-US order: month, day, year.
		await page.keyboard.type('03142027');
		const values = async () => [
			await form.getByLabel('Event').inputValue(),
			await form.getByLabel('From').inputValue(),
			await form.getByLabel('To').inputValue(),
		];
		// While its year is being typed From passes through years like 0002: To waits for a whole date.
		await expect(values()).resolves.toEqual(['Harbour practice day', '2027-03-14', '']);
		// Tab on until the focus leaves From for To (the date field may hold it for its picker first).
		const toId = await form.getByLabel('To').getAttribute('id');
		for (let i = 0; i < 4 && (await page.evaluate(() => document.activeElement?.id)) !== toId; i++)
			await page.keyboard.press('Tab');
		await expect(values()).resolves.toEqual(['Harbour practice day', '2027-03-14', '2027-03-14']);
		await page.keyboard.type('03152027');
		await expect(values()).resolves.toEqual(['Harbour practice day', '2027-03-14', '2027-03-15']);
		expect(own.problems).toEqual([]);
	});
});
