import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, signInToTeam } from '../helpers/browser';

const appUrl = inject('appUrl');

async function openMarlin(b: Browser) {
	await signInToTeam(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
	await b.page.getByRole('link', { name: 'Marlin', exact: true }).click();
	await b.page.waitForSelector('astro-island[component-export="BuildWorkspace"]:not([ssr])', {
		state: 'attached',
	});
	await b.page.getByRole('heading', { name: 'Cables: current, drop and protection' }).waitFor();
}

/** Whether an element lies wholly inside the window as it is scrolled now. */
const inView = (b: Browser, selector: string) =>
	b.page.evaluate((sel) => {
		const r = document.querySelector(sel)!.getBoundingClientRect();
		return r.top >= 0 && r.bottom <= window.innerHeight;
	}, selector);

describe('the build page as a workbench, in chromium', () => {
	const opened: Browser[] = [];
	afterAll(async () => {
		for (const b of opened) await b.close();
	});

	for (const viewport of [
		{ width: 1366, height: 900 },
		{ width: 390, height: 844 },
	])
		it(`at ${viewport.width} px: the summary stays in view beside the edited part with before → after, and Save says why it waits`, async () => {
			const b = await openBrowser({ viewport });
			opened.push(b);
			await openMarlin(b);
			const save = b.page.getByRole('button', { name: 'Save revision' });
			await expect(save.isDisabled()).resolves.toBe(true);
			await expect(b.page.locator('[data-save-blocked]').textContent()).resolves.toMatch(
				/Nothing to save/,
			);

			// The four-channel feed is 8 AWG: upsizing it raises that amplifier's voltage.
			const size = b.page.getByLabel('Four-channel feed: Size');
			await size.scrollIntoViewIfNeeded();
			await size.selectOption('awg:4');
			const lowest = b.page.locator('[data-summary] [data-figure="lowest"]');
			await lowest.locator('[data-change]').waitFor();
			await expect(lowest.locator('[data-change]').getAttribute('data-change')).resolves.toBe(
				'better',
			);
			await expect(lowest.textContent()).resolves.toMatch(/\d+\.\d\d → \d+\.\d\d/);
			// The summary and the field being edited are on screen together.
			await expect(inView(b, '[data-summary]')).resolves.toBe(true);
			await expect(
				size.evaluate((el) => {
					const r = el.getBoundingClientRect();
					return r.top >= 0 && r.bottom <= window.innerHeight;
				}),
			).resolves.toBe(true);
			await expect(b.page.locator('[data-save-blocked]').textContent()).resolves.toMatch(
				/Add a message saying what changed to save/,
			);
			const sideways = await b.page.evaluate(
				() => document.documentElement.scrollWidth - document.documentElement.clientWidth,
			);
			expect(sideways).toBeLessThanOrEqual(0);
			await b.screenshot(`workbench-summary-${viewport.width}`);
			// What the member sees while editing: the window as it is scrolled.
			await b.page.screenshot({
				path: `.data/screenshots/workbench-editing-${viewport.width}.png`,
			});
			await b.page.getByRole('button', { name: 'Four-channel feed', exact: true }).click();
			await b.page.locator('[data-inspector]').waitFor();
			await expect(
				b.page.locator('[data-inspector]').getByText('Current under burp').count(),
			).resolves.toBe(1);
			await b.page.screenshot({
				path: `.data/screenshots/workbench-inspector-${viewport.width}.png`,
			});
			await b.page.keyboard.press('Escape');
			await b.page.locator('[data-inspector]').waitFor({ state: 'detached' });
			expect(b.problems).toEqual([]);
		});

	it('adding an amplifier asks for its nodes and wires it as told, never to another amplifier’s terminals', async () => {
		const b = await openBrowser();
		opened.push(b);
		await openMarlin(b);
		await b.page.getByRole('button', { name: '+ Add to amplifiers' }).click();
		const form = b.page.getByRole('form', { name: 'Add a amplifier' });
		await form.getByLabel('Name').fill('Door amplifier');
		await expect(form.getByLabel('Power input (+)').inputValue()).resolves.toBe('__new__');
		await expect(form.getByLabel('Ground input (−)').inputValue()).resolves.toBe('__new__');
		await form.getByLabel('Feed the amplifier from').selectOption({ label: 'Distribution block' });
		await form.getByRole('button', { name: 'Add the amplifier' }).click();
		await form.waitFor({ state: 'detached' });

		const amp = b.page.getByLabel('Door amplifier: Amplifier');
		await amp.waitFor();
		await expect(b.page.getByLabel('Door amplifier feed: Cable').inputValue()).resolves.toBe(
			'Door amplifier feed',
		);
		await expect(b.page.getByLabel('Door amplifier ground: Cable').inputValue()).resolves.toBe(
			'Door amplifier ground',
		);
		await expect(b.page.getByLabel('Door amplifier +: Name').inputValue()).resolves.toBe(
			'Door amplifier +',
		);
		await b.page.locator('[data-summary] [data-figure="findings"]').waitFor();
		await b.screenshot('workbench-added-amplifier');
		expect(b.problems).toEqual([]);
	});
});
