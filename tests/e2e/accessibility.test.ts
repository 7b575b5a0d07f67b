import AxeBuilder from '@axe-core/playwright';
import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, signInToTeam } from '../helpers/browser';

const appUrl = inject('appUrl');

/** What axe-core finds on the page as it stands, keeping only critical and serious violations. */
async function seriousViolations(b: Browser): Promise<string[]> {
	const result = await new AxeBuilder({ page: b.page })
		.withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'best-practice'])
		.analyze();
	return result.violations
		.filter((v) => v.impact === 'critical' || v.impact === 'serious')
		.map(
			(v) =>
				`${v.id} (${v.impact}): ${v.help} — ${v.nodes
					.slice(0, 3)
					.map(
						(n) =>
							`${n.target.join(' ')} ${n.html.slice(0, 120)} ${n.failureSummary?.split('\n')[1] ?? ''}`,
					)
					.join(' | ')}`,
		);
}

/** The address of the first link on the page whose href matches, if there is one. */
const firstHref = (b: Browser, selector: string) =>
	b.page
		.locator(selector)
		.first()
		.getAttribute('href', { timeout: 5_000 })
		.catch(() => null);

async function settle(b: Browser, url: string) {
	await b.page.goto(url);
	await b.page.waitForLoadState('networkidle');
	// Islands render their figures after hydration; wait until none is still server-only.
	await b.page
		.waitForFunction(
			() => !document.querySelector('astro-island[ssr]:not([client="interact"])'),
			null,
			{ timeout: 15_000 },
		)
		.catch(() => undefined);
}

describe('accessibility (axe-core in chromium): no critical or serious violation', () => {
	const open: Browser[] = [];
	afterAll(async () => Promise.all(open.map((b) => b.close())));

	it('on the pages anyone can reach', async () => {
		const b = await openBrowser();
		open.push(b);
		const found: Record<string, string[]> = {};
		for (const path of [
			'/',
			'/sign-in',
			'/sign-up',
			'/forgot-password',
			'/no-such-page',
			'/unsubscribe?token=not-a-token',
		]) {
			await settle(b, `${appUrl}${path}`);
			const v = await seriousViolations(b);
			if (v.length) found[path] = v;
		}
		expect(found).toEqual({});
	});

	for (const user of DEMO_USERS) {
		it(`on every team page, signed in as the ${user.role}`, async () => {
			const b = await openBrowser();
			open.push(b);
			await signInToTeam(b, appUrl, user.email, DEMO_PASSWORD, DEMO_TEAM_NAME);
			const team = b.page.url();
			const pages = [
				`${appUrl}/teams`,
				team,
				`${team}/day`,
				`${team}/events`,
				`${team}/settings`,
				`${team}/shelf`,
				`${team}/season`,
				`${appUrl}/notifications`,
			];
			await b.page.goto(`${team}/events`);
			const checks = await firstHref(b, 'a[href*="/checks"]');
			if (checks) pages.push(new URL(checks, appUrl).href);
			await b.page.goto(team);
			await b.page.getByRole('link', { name: 'Pebble', exact: true }).click();
			await b.page.waitForURL(/\/vehicles\/[^/]+$/);
			const vehicle = b.page.url();
			pages.push(vehicle, `${vehicle}/runs`, `${vehicle}/history`, `${vehicle}/plans`);
			await b.page.goto(`${vehicle}/plans`);
			const plan = await firstHref(b, 'a[href*="/plans/"]');
			if (plan) pages.push(new URL(plan, appUrl).href);
			const found: Record<string, string[]> = {};
			for (const url of pages) {
				await settle(b, url);
				const v = await seriousViolations(b);
				if (v.length) found[url.replace(appUrl, '')] = v;
				// And on a phone: tables scroll sideways there, in regions a keyboard can reach.
				await b.page.setViewportSize({ width: 390, height: 844 });
				await b.page.waitForTimeout(150);
				const phone = await seriousViolations(b);
				if (phone.length) found[`${url.replace(appUrl, '')} at 390 px`] = phone;
				await b.page.setViewportSize({ width: 1366, height: 768 });
			}
			expect(found).toEqual({});
			expect(pages.length).toBeGreaterThanOrEqual(9);
		}, 420_000);
	}
});
