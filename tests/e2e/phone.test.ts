import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, signInToTeam } from '../helpers/browser';

const appUrl = inject('appUrl');

/** How far the page itself scrolls sideways (tables scroll inside their own boxes). */
const sideways = (b: Browser) =>
	b.page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);

describe('on a phone (390 px wide), in chromium', () => {
	let b: Browser;
	afterAll(async () => b?.close());

	it('no page scrolls sideways, and Sign out is in reach and works without a script', async () => {
		b = await openBrowser({ viewport: { width: 390, height: 844 } });
		await signInToTeam(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
		const team = b.page.url();
		const pages = [team, `${team}/events`, `${team}/settings`];
		await b.page.getByRole('link', { name: 'Pebble', exact: true }).click();
		await b.page.waitForSelector('astro-island[component-export="BuildWorkspace"]:not([ssr])', {
			state: 'attached',
		});
		const vehicle = b.page.url();
		pages.push(vehicle, `${vehicle}/runs`, `${vehicle}/history`, `${vehicle}/plans`);
		for (const url of pages) {
			await b.page.goto(url);
			await b.page.waitForLoadState('networkidle');
			expect(await sideways(b), `${url} scrolls sideways`).toBeLessThanOrEqual(0);
			const signOut = b.page.getByRole('button', { name: 'Sign out' });
			const box = (await signOut.boundingBox())!;
			expect(box.x + box.width, `Sign out is cut off on ${url}`).toBeLessThanOrEqual(390);
		}
		await b.screenshot('phone-build-page');
		await b.page.getByRole('button', { name: 'Sign out' }).click();
		await b.page.waitForURL(`${appUrl}/`);
		await b.page.goto(team);
		await b.page.waitForURL(/\/sign-in/);
		expect(b.problems).toEqual([]);
	});
});
