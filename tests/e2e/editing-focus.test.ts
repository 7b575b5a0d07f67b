import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import { type Browser, openBrowser, signUpWithBuild } from '../helpers/browser';

const appUrl = inject('appUrl');

/** Adding a part leaves the member in the new part's row, at 1366 px and on a phone. */
describe('focus after adding a part, in chromium', () => {
	let b: Browser;
	let buildUrl: string;
	beforeAll(async () => {
		b = await openBrowser({ viewport: { width: 1366, height: 768 } });
		buildUrl = await signUpWithBuild(b, appUrl, {
			name: 'Focus',
			slug: 'focus',
			document: pebbleBuild,
		});
	}, 120_000);
	afterAll(async () => b?.close());

	for (const viewport of [
		{ width: 1366, height: 768 },
		{ width: 390, height: 844 },
	]) {
		it(`moves focus to the new cable’s first field at ${viewport.width} px`, async () => {
			await b.page.setViewportSize(viewport);
			await b.page.goto(buildUrl);
			await b.page.waitForSelector('table[data-part-group="cables"]');
			const before = await b.page.locator('table[data-part-group="cables"] tbody tr').count();
			await b.page.getByRole('button', { name: '+ Add to cables' }).click();
			// The form opens with its name field focused: a held key types there, it adds nothing.
			await expect(
				b.page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.tagName),
			).resolves.toBe('INPUT');
			await b.page.keyboard.type(`Rear run ${viewport.width}`);
			await b.page.getByRole('button', { name: 'Add the cable' }).click();
			await b.page.waitForFunction(
				(n) =>
					document.querySelectorAll('table[data-part-group="cables"] tbody tr').length === n + 1,
				before,
			);
			const focus = await b.page.evaluate(() => {
				const el = document.activeElement as HTMLInputElement | null;
				const rows = document.querySelectorAll('table[data-part-group="cables"] tbody tr');
				return {
					inLastRow: !!el && rows[rows.length - 1]!.contains(el),
					tag: el?.tagName,
				};
			});
			expect(focus).toEqual({ inLastRow: true, tag: expect.stringMatching(/INPUT|SELECT/) });
		}, 60_000);
	}

	for (const viewport of [
		{ width: 1366, height: 768 },
		{ width: 390, height: 844 },
	]) {
		it(`shows every key figure in the first screen at ${viewport.width}×${viewport.height}, conditions as one line`, async () => {
			await b.page.setViewportSize(viewport);
			await b.page.goto(buildUrl);
			await b.page.locator('[data-summary]').waitFor();
			await b.page.waitForSelector('astro-island[component-export="BuildWorkspace"]:not([ssr])', {
				state: 'attached',
			});
			const outside = await b.page.evaluate(() =>
				[...document.querySelectorAll('[data-summary] [data-figure]')]
					.filter((el) => el.getBoundingClientRect().bottom > window.innerHeight)
					.map((el) => el.getAttribute('data-figure')),
			);
			expect(outside).toEqual([]);
			expect(await b.page.locator('[data-summary] [data-figure]').count()).toBeGreaterThanOrEqual(
				6,
			);
			// The conditions are one line until opened, in place.
			const conditions = b.page.locator('#conditions details');
			await expect(conditions.getAttribute('open')).resolves.toBeNull();
			await conditions.locator('summary').click();
			await b.page.getByLabel('Engine speed (rpm)').waitFor();
			// Remembered in this browser: open after a reload, until closed again.
			await b.page.reload();
			await b.page.getByLabel('Engine speed (rpm)').waitFor();
			await conditions.locator('summary').click();
			await expect(conditions.getAttribute('open')).resolves.toBeNull();
		}, 60_000);
	}

	it('keeps a tap on the conditions made before the page’s script arrives', async () => {
		await b.page.setViewportSize({ width: 390, height: 844 });
		await b.page.evaluate(async () => {
			localStorage.setItem('sagwise.conditions.open', '0');
			// The offline worker would answer the scripts from its cache, past the hold below.
			for (const r of await navigator.serviceWorker.getRegistrations()) await r.unregister();
		});
		// Hold the page's scripts until the member has tapped, as on a slow phone line.
		let release!: () => void;
		const released = new Promise<void>((resolve) => (release = resolve));
		const hold = async (route: import('playwright-core').Route) => {
			await released;
			await route.continue();
		};
		await b.page.route('**/_astro/**/*.js', hold);
		// Module scripts hold DOMContentLoaded back: go on once the page's HTML is in.
		await b.page.goto(buildUrl, { waitUntil: 'commit' });
		const conditions = b.page.locator('#conditions details');
		await conditions.locator('summary').click();
		await expect(
			b.page.locator('astro-island[component-export="BuildWorkspace"][ssr]').count(),
		).resolves.toBe(1);
		await expect(conditions.getAttribute('open')).resolves.toBe('');
		release();
		await b.page.waitForSelector('astro-island[component-export="BuildWorkspace"]:not([ssr])', {
			state: 'attached',
		});
		await b.page.unroute('**/_astro/**/*.js', hold);
		// Once awake it still reads open, says so, and this browser remembers it.
		await b.page.getByLabel('Engine speed (rpm)').waitFor();
		await conditions.getByText('Close', { exact: true }).waitFor();
		await b.page.reload();
		await b.page.getByLabel('Engine speed (rpm)').waitFor();
		await conditions.locator('summary').click();
		await expect(conditions.getAttribute('open')).resolves.toBeNull();
	}, 60_000);

	it('keeps every figure of the strip clear of the inspector at 1366 px', async () => {
		await b.page.setViewportSize({ width: 1366, height: 768 });
		await b.page.goto(buildUrl);
		await b.page.locator('[data-summary]').waitFor();
		await b.page
			.getByRole('navigation', { name: 'Parts of the build' })
			.getByRole('button')
			.first()
			.click();
		await b.page.locator('[data-inspector]').waitFor();
		const overlaps = await b.page.evaluate(() => {
			const panel = document.querySelector('[data-inspector]')!.getBoundingClientRect();
			return [...document.querySelectorAll('[data-summary] [data-figure]')]
				.filter((el) => {
					const r = el.getBoundingClientRect();
					return (
						r.right > panel.left &&
						r.left < panel.right &&
						r.bottom > panel.top &&
						r.top < panel.bottom
					);
				})
				.map((el) => el.getAttribute('data-figure'));
		});
		expect(overlaps).toEqual([]);
		expect(await b.page.locator('[data-summary] [data-figure]').count()).toBeGreaterThanOrEqual(6);
		// And none cut short: each figure's value and label reads whole in the narrower strip.
		const cut = await b.page.evaluate(() =>
			[...document.querySelectorAll('[data-summary] [data-figure] p')]
				.filter((p) => p.scrollWidth > p.clientWidth + 1)
				.map((p) => `${p.closest('[data-figure]')!.getAttribute('data-figure')}: ${p.textContent}`),
		);
		expect(cut).toEqual([]);
	}, 60_000);
});
