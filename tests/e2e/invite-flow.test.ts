import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, signInToTeam } from '../helpers/browser';

const appUrl = inject('appUrl');
/** Waits until the page's islands are live; forms that wake on use (client:interact) count as ready. */
const ready = (b: Browser) =>
	b.page.waitForFunction(
		() => !document.querySelector('astro-island[ssr]:not([client="interact"])'),
	);

describe('inviting a new member, in chromium', () => {
	const opened: Browser[] = [];
	afterAll(async () => {
		for (const b of opened) await b.close();
	});

	it('captain invites, invitee follows the mailed link from the outbox, signs up and sees the team', async () => {
		const invitee = `newcomer.${Date.now()}@sagwise.test`;

		// The captain signs in and invites.
		const cap = await openBrowser();
		opened.push(cap);
		await signInToTeam(cap, appUrl, DEMO_USERS[0].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
		await cap.page.getByRole('link', { name: /Members & settings/ }).click();
		await ready(cap);
		await cap.page.getByRole('textbox', { name: 'E-mail' }).fill(invitee);
		await cap.page.getByRole('button', { name: 'Send invitation' }).click();
		await expect(
			cap.page.getByText(`Invitation sent to ${invitee}`).waitFor(),
		).resolves.toBeUndefined();
		await cap.page.getByRole('listitem').filter({ hasText: invitee }).waitFor();
		await cap.screenshot('team-settings-after-invite');

		// The invitee, in a browser of their own, opens the mail in the development outbox.
		const inv = await openBrowser();
		opened.push(inv);
		await inv.page.goto(`${appUrl}/dev/outbox`);
		await inv.page
			.getByRole('link', { name: new RegExp(`to ${invitee.replace(/[.]/g, '\\.')}`) })
			.first()
			.click();
		await inv.screenshot('outbox-invitation');
		await inv.page.locator('a[data-mail-link][href*="/invitations/"]').click();
		await inv.page.getByRole('heading', { name: `Join ${DEMO_TEAM_NAME}` }).waitFor();
		await inv.page.getByRole('link', { name: 'Create an account' }).click();
		await ready(inv);
		await expect(inv.page.getByLabel('E-mail').inputValue()).resolves.toBe(invitee);
		await inv.page.getByLabel('Your name').fill('New Teammate');
		await inv.page.getByLabel('Password').fill('a long new password');
		await inv.page.getByRole('button', { name: 'Create the account' }).click();
		await inv.page.getByRole('button', { name: `Join ${DEMO_TEAM_NAME}` }).click();
		await inv.page.getByRole('heading', { name: DEMO_TEAM_NAME, level: 1 }).waitFor();
		await expect(inv.page.getByText('You are member').textContent()).resolves.toMatch(/member/);
		await inv.screenshot('invitee-sees-team');

		expect(cap.problems).toEqual([]);
		expect(inv.problems).toEqual([]);
	});
});
