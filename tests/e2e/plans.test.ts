import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { DEMO_PLANS } from '../../db/demo/plans';
import { type Browser, openBrowser, signInToTeam, signUpWithBuild } from '../helpers/browser';
import { pebbleBuild } from '../../db/demo/builds';
import { heavyValidNetwork } from '../bench/fixtures';

const appUrl = inject('appUrl');

const signIn = (b: Browser, email: string) =>
	signInToTeam(b, appUrl, email, DEMO_PASSWORD, DEMO_TEAM_NAME);

describe('upgrade plans in chromium', () => {
	const opened: Browser[] = [];
	afterAll(async () => {
		for (const b of opened) await b.close();
	});

	it('the captain compares the two demo plans, installs one, and the history shows it', async () => {
		const b = await openBrowser();
		opened.push(b);
		await signIn(b, DEMO_USERS[0].email);
		await b.page.getByRole('link', { name: 'Old Oak', exact: true }).click();
		await b.page.getByRole('link', { name: 'Plans', exact: true }).click();
		await b.page.waitForSelector('astro-island[component-export="PlansBoard"]:not([ssr])', {
			state: 'attached',
		});
		const [first, second] = DEMO_PLANS;
		await b.page.getByLabel(`Compare ${first!.name}`).check();
		await b.page.getByLabel(`Compare ${second!.name}`).check();
		const table = b.page.getByRole('table', { name: 'Current build and plans side by side' });
		await table.waitFor();
		await expect(table.locator('thead th').allTextContents()).resolves.toEqual([
			'Figure',
			expect.stringMatching(/Current build/),
			expect.stringContaining(first!.name),
			expect.stringContaining(second!.name),
		]);
		// Both plans raise the weakest amplifier's voltage, so both show a positive dB figure.
		const dbRow = table.getByRole('row', { name: /Output against the current build/ });
		await expect(dbRow.textContent()).resolves.toMatch(/0\.00 dB.*\+0\.\d\d dB.*\+0\.\d\d dB/);
		// The parts totals from the demo lists: 890 + 420 + 38.50 + 15 × 6.20 + 54 + 2 × 4.75 = 1310 + 38.50 + 93 + 54 + 9.50 = 1505.00.
		await expect(table.getByRole('row', { name: /Parts cost/ }).textContent()).resolves.toContain(
			'$1,505.00',
		);
		await b.page
			.getByRole('img', { name: 'Lowest amplifier voltage for the current build and each plan' })
			.waitFor();
		await b.screenshot('plans-comparison');

		b.page.once('dialog', (d) => void d.accept());
		await table.getByRole('button', { name: 'Install as next revision' }).first().click();
		await b.page.getByText(`“${first!.name}” is now revision 4 of the build.`).waitFor();
		await table.getByText('✓ installed as r4').waitFor();
		await expect(table.getByText('✓ installed as r4').count()).resolves.toBe(1);

		await b.page.getByRole('link', { name: 'See the history' }).click();
		const entry = b.page.locator('[data-revision="4"]');
		await entry.waitFor();
		await expect(entry.textContent()).resolves.toContain(`Installed plan “${first!.name}”`);
		await expect(entry.textContent()).resolves.toMatch(/Alternator “Alternator 3”/);
		await expect(entry.getByRole('link', { name: 'from a plan' }).count()).resolves.toBe(1);
		await b.screenshot('plans-installed-history');
		expect(b.problems).toEqual([]);
	});

	it('a member edits a plan’s parts list: a bad price is named beside the field and the total follows', async () => {
		const b = await openBrowser();
		opened.push(b);
		await signIn(b, DEMO_USERS[1].email);
		await b.page.getByRole('link', { name: 'Old Oak', exact: true }).click();
		await b.page.getByRole('link', { name: 'Plans', exact: true }).click();
		await b.page.getByRole('link', { name: DEMO_PLANS[1]!.name }).click();
		await b.page.waitForSelector('astro-island[component-export="PlanWorkspace"]:not([ssr])', {
			state: 'attached',
		});
		// 2 × 575 + 48 × 6.20 + 16 × 4.75 + 2 × 32 = 1150 + 297.60 + 76 + 64 = 1587.60.
		await expect(b.page.getByTestId('parts-total').textContent()).resolves.toBe('$1,587.60');
		await b.page.getByRole('button', { name: '+ Add a part' }).click();
		await b.page.getByLabel('Item 5').fill('Terminal covers');
		await b.page.getByLabel('Quantity 5').fill('4');
		await b.page.getByLabel('Unit price 5').fill('2.505');
		await b.page.getByText('Prices have at most two decimals').waitFor();
		await expect(b.page.getByRole('button', { name: 'Save plan' }).isDisabled()).resolves.toBe(
			true,
		);
		await b.page.getByLabel('Unit price 5').fill('2.50');
		await expect(b.page.getByTestId('parts-total').textContent()).resolves.toBe('$1,597.60');
		// A reload before saving loses nothing: the draft comes back from this browser.
		const leave = (d: import('playwright-core').Dialog) => void d.accept();
		b.page.on('dialog', leave);
		await b.page.reload();
		b.page.off('dialog', leave);
		await b.page.waitForSelector('astro-island[component-export="PlanWorkspace"]:not([ssr])', {
			state: 'attached',
		});
		await b.page
			.getByText('Your unsaved changes to this plan from this browser are back.')
			.waitFor();
		await expect(b.page.getByLabel('Unit price 5').inputValue()).resolves.toBe('2.50');
		await b.page.getByRole('button', { name: 'Save plan' }).click();
		await b.page.getByText('Plan saved.').waitFor();
		await b.page.reload();
		await expect(b.page.getByText(/unsaved changes/).count()).resolves.toBe(0);
		await b.page.waitForSelector('astro-island[component-export="PlanWorkspace"]:not([ssr])', {
			state: 'attached',
		});
		await expect(b.page.getByLabel('Item 5').inputValue()).resolves.toBe('Terminal covers');
		await b.page.getByRole('heading', { name: 'What the plan changes' }).waitFor();
		await b.screenshot('plan-editor');
	});

	it('a member starts a plan from the current revision and lands in its editor', async () => {
		const b = await openBrowser();
		opened.push(b);
		await signIn(b, DEMO_USERS[1].email);
		await b.page.getByRole('link', { name: 'Marlin', exact: true }).click();
		await b.page.getByRole('link', { name: 'Plans', exact: true }).click();
		await b.page.waitForSelector('astro-island[component-export="PlansBoard"]:not([ssr])', {
			state: 'attached',
		});
		await b.page.getByText('No plans yet.', { exact: false }).waitFor();
		await b.page.getByLabel('New plan').fill('Third AGM string');
		await b.page.getByRole('button', { name: 'Start the plan' }).click();
		await b.page.waitForSelector('astro-island[component-export="PlanWorkspace"]:not([ssr])', {
			state: 'attached',
		});
		await expect(b.page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe(
			'Plan: Third AGM string',
		);
		await b.page.getByText(/Nothing yet: the plan is the same as revision 3/).waitFor();
		expect(b.problems).toEqual([]);
	});

	it('a member opens a plan too large to come with the page: it loads once live, and the API gives it whole', async () => {
		const b = await openBrowser();
		opened.push(b);
		// A team of its own: the demo's vehicles stay as other tests (and their page checks) expect.
		const vehicleUrl = await signUpWithBuild(b, appUrl, {
			name: 'Large plan',
			slug: 'large-plan',
			document: pebbleBuild,
		});
		const [, teamId, vehicleId] = /teams\/([^/]+)\/vehicles\/([^/?#]+)/.exec(vehicleUrl)!;
		const made = await b.page.request.fetch(
			`${appUrl}/api/teams/${teamId}/vehicles/${vehicleId}/plans`,
			{
				method: 'POST',
				headers: { Origin: appUrl, 'content-type': 'application/json' },
				data: JSON.stringify({ name: 'Every trunk run doubled', document: heavyValidNetwork(400) }),
			},
		);
		expect(made.status()).toBe(201);
		const plan = (await made.json()) as { id: string };
		const url = `${appUrl}/teams/${teamId}/vehicles/${vehicleId}/plans/${plan.id}`;
		// The page itself carries no document: it is small whatever the plan's size.
		const served = await (await b.page.request.get(url)).text();
		expect(served.length).toBeLessThan(120_000);
		expect(served).toContain('Loading the plan’s');
		await b.page.goto(url);
		await b.page.waitForSelector('astro-island[component-export="PlanWorkspace"]:not([ssr])', {
			state: 'attached',
		});
		await b.page.locator('[data-summary] [data-figure]').first().waitFor();
		await expect(b.page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe(
			'Plan: Every trunk run doubled',
		);
		// The API's plan is the plan as made, document and all.
		const api = (await (
			await b.page.request.get(
				`${appUrl}/api/teams/${teamId}/vehicles/${vehicleId}/plans/${plan.id}`,
			)
		).json()) as { name: string; document: unknown; version: number };
		expect(api.name).toBe('Every trunk run doubled');
		expect(api.document).toEqual(heavyValidNetwork(400));
		expect(b.problems).toEqual([]);
	}, 120_000);
});
