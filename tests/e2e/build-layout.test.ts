import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { marlinBuild } from '../../db/demo/builds';
import { upgradeHints } from '../../src/engine/hints';
import { DEFAULT_SCENARIO } from '../../src/engine/report';
import type { BuildDocument } from '../../src/engine/types';
import { type Browser, openBrowser, signUpWithBuild } from '../helpers/browser';

const appUrl = inject('appUrl');
const LAPTOP = { width: 1366, height: 768 };
const PHONE = { width: 390, height: 844 };

/**
 * The build page as a captain meets it: the state of the system, then what to change next, then
 * sections reachable from a navigation that stays at hand; a diagram a person can read.
 */
describe('the build page’s layout, in chromium', () => {
	let b: Browser;
	let buildUrl: string;
	let api: (path: string) => Promise<unknown>;
	beforeAll(async () => {
		// As a newcomer: the page's own choice of open sections.
		b = await openBrowser({ viewport: LAPTOP, sections: 'default' });
		buildUrl = await signUpWithBuild(b, appUrl, {
			name: 'Layout',
			slug: 'layout',
			document: marlinBuild,
		});
		api = async (path) => (await b.page.request.get(`${appUrl}${path}`)).json();
	}, 120_000);
	afterAll(async () => b?.close());

	it('starts the ranked upgrades within two screens and stays within four at 1366×768', async () => {
		await b.page.setViewportSize(LAPTOP);
		await b.page.goto(buildUrl);
		await b.page.locator('[data-upgrades] li').first().waitFor();
		const at = await b.page.evaluate(() => ({
			upgrades: document.getElementById('section-upgrades')!.getBoundingClientRect().top + scrollY,
			height: document.documentElement.scrollHeight,
			screen: innerHeight,
		}));
		expect(at.upgrades).toBeLessThan(2 * at.screen);
		expect(at.height).toBeLessThanOrEqual(4 * at.screen);
		// Each line says the volts and the dB it gives back.
		const first = b.page.locator('[data-upgrades] li').first();
		await expect(first.locator('[data-gain-db]').textContent()).resolves.toMatch(
			/[+-]\d+\.\d\d\s*dB/,
		);
	}, 60_000);

	for (const viewport of [LAPTOP, PHONE]) {
		it(`opens a closed section from the in-page navigation and remembers it at ${viewport.width} px`, async () => {
			await b.page.setViewportSize(viewport);
			await b.page.goto(buildUrl);
			const toggle = b.page.locator('#section-heating h2 button');
			await expect(toggle.getAttribute('aria-expanded')).resolves.toBe('false');
			await b.page
				.getByRole('navigation', { name: 'Sections of the page' })
				.getByRole('link', { name: 'Heating' })
				.click();
			await expect(toggle.getAttribute('aria-expanded')).resolves.toBe('true');
			await b.page.locator('#section-heating table').first().waitFor();
			// Its heading comes to rest just under the sticky summary, in view, with focus on it.
			await b.page.waitForFunction(() => {
				const strip = document.querySelector('[data-summary]')!.getBoundingClientRect();
				const h = document.querySelector('#section-heating h2')!.getBoundingClientRect();
				return h.top >= strip.bottom - 1 && h.top < strip.bottom + 40;
			});
			await expect(
				b.page.evaluate(() => document.activeElement?.closest('section')?.id),
			).resolves.toBe('section-heating');
			// The nav is still on screen down here.
			await expect(
				b.page.getByRole('navigation', { name: 'Sections of the page' }).isVisible(),
			).resolves.toBe(true);
			// Remembered by this browser (the address without the section's #, which would open it too).
			await b.page.goto(buildUrl);
			await b.page.locator('#section-heating table').first().waitFor();
			await toggle.click();
			await expect(toggle.getAttribute('aria-expanded')).resolves.toBe('false');
			await b.page.goto(buildUrl);
			await b.page.locator('[data-summary]').waitFor();
			await b.page.waitForTimeout(300);
			await expect(b.page.locator('#section-heating table').count()).resolves.toBe(0);
		}, 60_000);
	}

	it('serves the diagram’s frame at its size and draws it once the page is live', async () => {
		// The drawing is a third of the page's markup and sits below the first screens.
		const served = await (await b.page.request.get(buildUrl)).text();
		const frame =
			/<svg width="(\d+)" height="(\d+)"[^>]*data-network-diagram[^>]*>(.*?)<\/svg>/s.exec(served);
		expect(frame).not.toBeNull();
		expect(frame![3]).not.toContain('data-part');
		await b.page.setViewportSize(LAPTOP);
		await b.page.goto(buildUrl);
		const live = b.page.locator('[data-network-diagram][data-drawn]');
		await live.locator('[data-part]').first().waitFor();
		await expect(live.getAttribute('width')).resolves.toBe(frame![1]);
		await expect(live.getAttribute('height')).resolves.toBe(frame![2]);
	}, 60_000);

	for (const viewport of [LAPTOP, PHONE]) {
		it(`draws the network with 11 px labels, no cable through a label and a column per part at ${viewport.width} px`, async () => {
			await b.page.setViewportSize(viewport);
			await b.page.goto(buildUrl);
			await b.page.locator('[data-network-diagram] [data-part]').first().waitFor();
			const check = await b.page.evaluate(() => {
				const svg = document.querySelector<SVGSVGElement>('[data-network-diagram]')!;
				const scale = svg.getScreenCTM()!.a;
				const texts = [...svg.querySelectorAll<SVGTextElement>('text')];
				const smallest = Math.min(
					...texts.map((t) => parseFloat(getComputedStyle(t).fontSize) * scale),
				);
				// Every cable, sampled along its length, against every name's box (and a part's frame).
				const boxes = [
					...svg.querySelectorAll<SVGGraphicsElement>('[data-label], [data-label-box]'),
				].map((el) => el.getBBox());
				const crossings: string[] = [];
				for (const path of svg.querySelectorAll<SVGPathElement>('path[data-cable]')) {
					const len = path.getTotalLength();
					for (let i = 0; i <= 60; i++) {
						const p = path.getPointAtLength((len * i) / 60);
						if (
							boxes.some(
								(r) => p.x > r.x && p.x < r.x + r.width && p.y > r.y && p.y < r.y + r.height,
							)
						)
							crossings.push(path.getAttribute('data-cable')!);
					}
				}
				const columns = [...svg.querySelectorAll('[data-part]')].map((g) =>
					g.getAttribute('data-column'),
				);
				return { smallest, crossings: [...new Set(crossings)], columns, parts: columns.length };
			});
			expect(check.smallest).toBeGreaterThanOrEqual(11);
			expect(check.crossings).toEqual([]);
			expect(new Set(check.columns).size).toBe(check.parts);
			expect(check.parts).toBe(
				marlinBuild.amplifiers.length +
					marlinBuild.banks.length +
					marlinBuild.alternators.length +
					marlinBuild.loads.length,
			);
			// And the connections as a list, for a screen too narrow to take the drawing in at once.
			await b.page.getByText('List the connections').click();
			await b.page.locator('[data-connections] li').first().waitFor();
			await expect(b.page.locator('[data-connections] li').count()).resolves.toBe(
				marlinBuild.cables.length + check.parts,
			);
		}, 60_000);
	}

	it('shows each part’s whole name and each From/To choice in the part tables at 1366 px', async () => {
		await b.page.setViewportSize(LAPTOP);
		await b.page.goto(buildUrl);
		await b.page
			.getByRole('navigation', { name: 'Sections of the page' })
			.getByRole('link', { name: 'Parts' })
			.click();
		await b.page.locator('table[data-part-group="cables"] tbody tr').first().waitFor();
		const cut = await b.page.evaluate(() => {
			const out: string[] = [];
			const measure = document.createElement('span');
			measure.style.cssText = 'position:absolute;visibility:hidden;white-space:pre';
			document.body.append(measure);
			for (const el of document.querySelectorAll<HTMLInputElement | HTMLSelectElement>(
				'table[data-part-group] input:not([type]), table[data-part-group] input[type="text"], table[data-part-group] select',
			)) {
				const text =
					el instanceof HTMLSelectElement ? (el.selectedOptions[0]?.text ?? '') : el.value;
				measure.style.font = getComputedStyle(el).font;
				measure.textContent = text;
				// The select's arrow takes about 20 px of its box.
				const room = el.clientWidth - (el instanceof HTMLSelectElement ? 20 : 8);
				if (measure.getBoundingClientRect().width > room + 0.5)
					out.push(`${el.getAttribute('aria-label')}: ${text}`);
			}
			measure.remove();
			return out;
		});
		expect(cut).toEqual([]);
	}, 60_000);

	it('makes a plan of a ranked upgrade that holds exactly that change', async () => {
		await b.page.setViewportSize(LAPTOP);
		await b.page.goto(buildUrl);
		const first = b.page.locator('[data-upgrades] li').first();
		await first.waitFor();
		const description = (await first.locator('span').nth(1).textContent())!.trim();
		await first.getByRole('button', { name: /^Make a plan of this/ }).click();
		await b.page.waitForURL(/\/plans\/[0-9a-f-]{36}$/);
		const [, teamId, vehicleId, planId] =
			/\/teams\/([^/]+)\/vehicles\/([^/]+)\/plans\/([^/]+)$/.exec(b.page.url())!;
		const plan = (await api(`/api/teams/${teamId}/vehicles/${vehicleId}/plans/${planId}`)) as {
			name: string;
			document: BuildDocument;
		};
		// The engine's own ranking of the same build under the page's default conditions.
		const expected = upgradeHints(marlinBuild, {
			engineRpm: DEFAULT_SCENARIO.engineRpm,
			demand: DEFAULT_SCENARIO.burpDemand,
			conductorTempC: DEFAULT_SCENARIO.conductorTempC,
		})[0]!;
		expect(plan.name).toBe(description);
		expect(expected.description).toBe(description);
		expect(plan.document).toEqual(expected.document);
		// The plan page opens on it, its changes listing the one change.
		await b.page
			.getByRole('heading', { name: /changes/i })
			.first()
			.waitFor();
	}, 60_000);
});
