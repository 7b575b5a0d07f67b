import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, openDemoVehicle } from '../helpers/browser';

const appUrl = inject('appUrl');

const openMarlin = (b: Browser) =>
	openDemoVehicle(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME, 'Marlin');

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

	for (const viewport of [
		{ width: 1366, height: 900 },
		{ width: 390, height: 844 },
	])
		it(`at ${viewport.width} px: adding an amplifier asks for its nodes and wires it as told, never to another amplifier’s terminals`, async () => {
			const b = await openBrowser({ viewport });
			opened.push(b);
			await openMarlin(b);
			await b.page.getByRole('button', { name: '+ Add to amplifiers' }).click();
			const form = b.page.getByRole('form', { name: 'Add an amplifier' });
			await form.getByLabel('Name').fill('Door amplifier');
			await expect(form.getByLabel('Power input (+)').inputValue()).resolves.toBe('__new__');
			await expect(form.getByLabel('Ground input (−)').inputValue()).resolves.toBe('__new__');
			await form
				.getByLabel('Feed the amplifier from')
				.selectOption({ label: 'Distribution block' });
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
			await b.screenshot(`workbench-added-amplifier-${viewport.width}`);
			expect(b.problems).toEqual([]);
		});

	it('at 390 px: clearing a cable length and retyping it keeps the focus and the place, with the error in words', async () => {
		const b = await openBrowser({ viewport: { width: 390, height: 844 } });
		opened.push(b);
		await openMarlin(b);
		const length = b.page.getByLabel('Bass B feed: Length');
		await length.scrollIntoViewIfNeeded();
		await length.click();
		// Where the field sits in the window: the member's place, whatever the page does around it.
		const top = () => length.evaluate((el) => el.getBoundingClientRect().top);
		const placeBefore = await top();
		await length.press('Control+a');
		await length.press('Backspace');
		await expect(length.evaluate((el) => el === document.activeElement)).resolves.toBe(true);
		await b.page.getByText(/Cable “Bass B feed”: Length must be a number/).waitFor();
		await b.page
			.locator('[data-summary]')
			.getByText(/Out of date/)
			.waitFor();
		await length.pressSequentially('4.5', { delay: 30 });
		await expect(length.inputValue()).resolves.toBe('4.5');
		await expect(length.evaluate((el) => el === document.activeElement)).resolves.toBe(true);
		await expect(b.page.getByText(/Length must be a number/).count()).resolves.toBe(0);
		await b.page.waitForTimeout(600); // the tables and charts catch up after the frame
		expect(Math.abs((await top()) - placeBefore)).toBeLessThan(5);
		expect(b.problems).toEqual([]);
	});
});
