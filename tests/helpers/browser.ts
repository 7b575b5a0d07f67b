import { mkdtempSync, mkdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { type BrowserContext, chromium, type Page } from 'playwright-core';

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
export const SCREENSHOT_DIR = '.data/screenshots';

export interface Browser {
	context: BrowserContext;
	page: Page;
	/** Console errors and failed requests seen so far. */
	problems: string[];
	screenshot: (name: string) => Promise<string>;
	close: () => Promise<void>;
}

/** Debian's chromium, headless, with a fresh profile; never a downloaded browser. */
export async function openBrowser(
	opts: {
		viewport?: { width: number; height: number };
		/** The browser's own time zone (IANA name), e.g. one other than the server's. */
		timezoneId?: string;
		/**
		 * The build page's sections as a member who has opened them all (`open`, what most tests
		 * drive), or as a newcomer sees them (`default`: the page's own choice of open sections).
		 */
		sections?: 'open' | 'default';
	} = {},
): Promise<Browser> {
	const profile = mkdtempSync(path.join(tmpdir(), 'sagwise-profile-'));
	const context = await chromium.launchPersistentContext(profile, {
		executablePath: CHROMIUM_PATH,
		headless: true,
		viewport: opts.viewport ?? { width: 1280, height: 900 },
		...(opts.timezoneId ? { timezoneId: opts.timezoneId } : {}),
		args: [
			'--headless',
			'--no-sandbox',
			'--disable-gpu',
			'--disable-quic',
			'--no-first-run',
			'--disable-background-networking',
			'--disable-component-update',
			'--disable-sync',
		],
	});
	if ((opts.sections ?? 'open') === 'open')
		await context.addInitScript(() => {
			// Not every document may touch storage (a sandboxed mail preview, an error page).
			try {
				const key = 'sagwise.sections.build';
				if (localStorage.getItem(key) === null)
					localStorage.setItem(
						key,
						JSON.stringify({
							network: true,
							supply: true,
							session: true,
							speed: true,
							heating: true,
							parts: true,
						}),
					);
			} catch {
				// Nothing to open there.
			}
		});
	const page = context.pages()[0] ?? (await context.newPage());
	const problems: string[] = [];
	page.on('console', (msg) => {
		if (msg.type() === 'error') problems.push(`console: ${msg.text()}`);
	});
	page.on('pageerror', (error) => problems.push(`page error on ${page.url()}: ${error.message}`));
	page.on('requestfailed', (req) => {
		// A navigation or reload cancels what the old page was still loading: not a fault.
		if (req.failure()?.errorText === 'net::ERR_ABORTED') return;
		problems.push(`request failed: ${req.url()} ${req.failure()?.errorText ?? ''}`);
	});
	mkdirSync(SCREENSHOT_DIR, { recursive: true });
	return {
		context,
		page,
		problems,
		screenshot: async (name) => {
			const file = path.join(SCREENSHOT_DIR, `${name}.png`);
			await page.screenshot({ path: file, fullPage: true, caret: 'initial' });
			return file;
		},
		close: async () => {
			await context.close();
			rmSync(profile, { recursive: true, force: true });
		},
	};
}

/** Signs a demo user in with their password and opens the demo team's dashboard. */
export async function signInToTeam(
	b: Browser,
	appUrl: string,
	email: string,
	password: string,
	teamName: string,
): Promise<void> {
	await b.page.goto(`${appUrl}/sign-in?callbackUrl=/teams`);
	// The form is live HTML at once; its script loads when it is used (client:interact).
	await b.page.getByLabel('E-mail').fill(email);
	await b.page.getByLabel('Password').fill(password);
	await b.page.getByRole('button', { name: 'Sign in' }).click();
	await b.page.waitForURL(`${appUrl}/teams`);
	await b.page.getByRole('link', { name: new RegExp(teamName) }).click();
}

/** Signs the demo member in and opens a vehicle's runs page, its island live. */
export async function openVehicleRuns(
	b: Browser,
	appUrl: string,
	email: string,
	password: string,
	teamName: string,
	vehicle: string,
): Promise<void> {
	await signInToTeam(b, appUrl, email, password, teamName);
	await b.page.getByRole('link', { name: vehicle, exact: true }).click();
	await b.page.getByRole('link', { name: 'Runs', exact: true }).click();
	await b.page.waitForSelector('astro-island[component-export="VehicleRuns"]:not([ssr])', {
		state: 'attached',
	});
}

/** A fresh account that makes a team of its own (for tests that change what they touch). */
export async function signUpWithTeam(
	b: Browser,
	appUrl: string,
	who: { name: string; email: string; password: string; team: string },
): Promise<void> {
	await b.page.goto(`${appUrl}/sign-up`);
	await b.page.getByLabel('Your name').fill(who.name);
	await b.page.getByLabel('E-mail').fill(who.email);
	await b.page.getByLabel('Password').fill(who.password);
	await b.page.getByRole('button', { name: 'Create the account' }).click();
	await b.page.waitForURL(/\/teams/);
	await b.page.getByLabel('New team name').fill(who.team);
	await b.page.getByRole('button', { name: 'Create the team' }).click();
	await b.page.getByRole('heading', { name: who.team, level: 1 }).waitFor();
}

/**
 * A new captain with a team of their own and one vehicle whose build starts as `document`, signed in
 * in `b`; answers the build page's address.
 */
export async function signUpWithBuild(
	b: Browser,
	appUrl: string,
	who: { name: string; slug: string; document: unknown },
): Promise<string> {
	const stamp = Date.now();
	await signUpWithTeam(b, appUrl, {
		name: who.name,
		email: `${who.slug}-${stamp}@sagwise.test`,
		password: `${who.slug}-captain-2026`,
		team: `${who.name} Team ${stamp}`,
	});
	const teamId = /\/teams\/([0-9a-f-]{36})/.exec(b.page.url())![1]!;
	const post = async (path: string, data: unknown) => {
		const res = await b.page.request.fetch(`${appUrl}${path}`, {
			method: 'POST',
			headers: { Origin: appUrl, 'content-type': 'application/json' },
			data: JSON.stringify(data),
		});
		if (res.status() !== 201) throw new Error(`${path} answered ${res.status()}`);
		return (await res.json()) as { id: string };
	};
	const v = await post(`/api/teams/${teamId}/vehicles`, { name: `${who.name} car` });
	await post(`/api/teams/${teamId}/vehicles/${v.id}/revisions`, {
		parentId: null,
		message: 'Start',
		document: who.document,
	});
	return `${appUrl}/teams/${teamId}/vehicles/${v.id}`;
}

/** Signs in to the demo team and opens one of its vehicles' build page, live. */
export async function openDemoVehicle(
	b: Browser,
	appUrl: string,
	email: string,
	password: string,
	teamName: string,
	vehicle: string,
): Promise<void> {
	await signInToTeam(b, appUrl, email, password, teamName);
	await b.page.getByRole('link', { name: vehicle, exact: true }).click();
	await b.page.waitForSelector('astro-island[component-export="BuildWorkspace"]:not([ssr])', {
		state: 'attached',
	});
	await b.page.getByRole('heading', { name: 'Cables: current, drop and protection' }).waitFor();
}
