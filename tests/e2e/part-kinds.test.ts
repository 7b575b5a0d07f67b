import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, openDemoVehicle } from '../helpers/browser';

const appUrl = inject('appUrl');

const openPebble = (b: Browser) =>
	openDemoVehicle(b, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME, 'Pebble');

describe('adding the newer kinds of part through the add-part form, in chromium', () => {
	const opened: Browser[] = [];
	afterAll(async () => {
		for (const b of opened) await b.close();
	});

	for (const viewport of [
		{ width: 1366, height: 900 },
		{ width: 390, height: 844 },
	])
		it(`at ${viewport.width} px: a member adds a relay to a rear node, turns it into a diode isolator and reads its figures`, async () => {
			const b = await openBrowser({ viewport });
			opened.push(b);
			await openPebble(b);
			await b.page.getByRole('button', { name: '+ Add to relays and isolators' }).click();
			const form = b.page.getByRole('form', { name: 'Add an isolator' });
			await form.getByLabel('Name').fill('Rear relay');
			// It suggests the battery's node as the supply side and a new node behind it.
			await expect(form.getByLabel('Far side (to)').inputValue()).resolves.toBe('__new__');
			await form.getByRole('button', { name: 'Add the isolator' }).click();
			await form.waitFor({ state: 'detached' });

			// The work goes on in its row: focus on its first field.
			const name = b.page.getByLabel('Rear relay: Relay or isolator');
			await expect.poll(() => name.evaluate((el) => el === document.activeElement)).toBe(true);
			await expect(b.page.getByLabel('Rear relay: Conducts').inputValue()).resolves.toBe(
				'engine_running',
			);
			// Drawn as a link between the battery's node and its new node, and listed.
			await b.page.locator('[data-isolator]').first().waitFor({ state: 'attached' });

			await b.page.getByLabel('Rear relay: Kind').selectOption('diode');
			await expect
				.poll(() => b.page.getByLabel('Rear relay: Forward drop').inputValue())
				.toBe('0.7');

			await b.page.getByRole('button', { name: 'Rear relay', exact: true }).click();
			const inspector = b.page.locator('[data-inspector]');
			await inspector.waitFor();
			await expect(inspector.textContent()).resolves.toMatch(/At this engine speed/);
			await expect(inspector.textContent()).resolves.toMatch(/free to conduct forward/);
			await b.screenshot(`part-kinds-isolator-${viewport.width}`);
			await b.page.keyboard.press('Escape');
			expect(b.problems).toEqual([]);
		});

	it('a member adds a capacitor bank beside the amplifier and sees its share of the burp', async () => {
		const b = await openBrowser({ viewport: { width: 1366, height: 900 } });
		opened.push(b);
		await openPebble(b);
		await b.page.getByRole('button', { name: '+ Add to capacitor banks' }).click();
		const form = b.page.getByRole('form', { name: 'Add a capacitor bank' });
		await form.getByLabel('Name').fill('Door caps');
		// Suggested beside the amplifiers, to the chassis.
		await expect(form.getByLabel('Positive terminal').inputValue()).resolves.not.toBe('__new__');
		await form.getByRole('button', { name: 'Add the capacitor bank' }).click();
		await form.waitFor({ state: 'detached' });
		const series = b.page.getByLabel('Door caps: Modules in series');
		await expect.poll(() => series.inputValue()).toBe('1');
		// One 16 V module under a 14.4 V regulator is inside its rating; six 2.7 V ones in series too.
		await b.page.getByLabel('Door caps: Rated voltage per module').fill('2.7');
		await series.fill('6');
		await b.page.getByRole('button', { name: 'Door caps', exact: true }).click();
		const inspector = b.page.locator('[data-inspector]');
		await inspector.waitFor();
		await expect.poll(() => inspector.textContent()).toMatch(/Rated voltage16\.2 V/);
		await expect(inspector.textContent()).resolves.toMatch(/Share of the first 100 ms\d+ %/);
		await b.screenshot('part-kinds-capacitor-1366');
		// Five modules are 13.5 V: under the charging voltage, a danger finding on the part.
		await b.page.getByLabel('Inspector · Door caps: Modules in series').fill('5');
		await expect.poll(() => inspector.textContent()).toMatch(/above its rating of 13\.50 V/);
		expect(b.problems).toEqual([]);
	});

	it('a member adds a DC-DC charger to a new node, is told the node needs its bank, adds the bank and reads the charger', async () => {
		const b = await openBrowser({ viewport: { width: 1366, height: 900 } });
		opened.push(b);
		await openPebble(b);
		await b.page.getByRole('button', { name: '+ Add to dc-dc chargers' }).click();
		const form = b.page.getByRole('form', { name: 'Add a dc-dc charger' });
		await form.getByLabel('Name').fill('Aux charger');
		await expect(form.getByLabel('Output to (the bank it charges)').inputValue()).resolves.toBe(
			'__new__',
		);
		await form.getByRole('button', { name: 'Add the dc-dc charger' }).click();
		await form.waitFor({ state: 'detached' });
		// Its new node has nothing yet to tie it to the chassis: said plainly, nothing lost.
		await b.page
			.getByText(/“Aux charger end” is not connected|Aux charger end" is not connected/)
			.first()
			.waitFor();
		await expect(b.page.getByLabel('Aux charger: Output limit').inputValue()).resolves.toBe('40');

		await b.page.getByRole('button', { name: '+ Add to battery banks' }).click();
		const bankForm = b.page.getByRole('form', { name: 'Add a bank' });
		await bankForm.getByLabel('Name').fill('Aux bank');
		await bankForm.getByLabel('Positive terminal').selectOption({ label: 'Aux charger end' });
		await bankForm.getByRole('button', { name: 'Add the bank' }).click();
		await bankForm.waitFor({ state: 'detached' });

		await b.page.getByRole('button', { name: 'Aux charger', exact: true }).click();
		const inspector = b.page.locator('[data-inspector]');
		await inspector.waitFor();
		await expect.poll(() => inspector.textContent()).toMatch(/Output, music\d+ A at \d+\.\d\d V/);
		await b.screenshot('part-kinds-charger-1366');
		expect(b.problems).toEqual([]);
	});
});
