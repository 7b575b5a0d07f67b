import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, signInToTeam } from '../helpers/browser';
import { linkIn, waitForMail } from '../helpers/mail';

const appUrl = inject('appUrl');
const outbox = inject('outboxDir');

/** A member asks the captain something beside a revision; the captain sees it on a phone. */
describe('comments with a mention, in chromium', () => {
	const opened: Browser[] = [];
	afterAll(async () => {
		for (const b of opened) await b.close();
	});

	it('a member mentions the captain beside a revision; the captain is notified and reads it', async () => {
		const member = await openBrowser({ viewport: { width: 1366, height: 900 } });
		opened.push(member);
		await signInToTeam(member, appUrl, DEMO_USERS[1].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
		const marlin = await member.page
			.getByRole('link', { name: 'Marlin', exact: true })
			.getAttribute('href');
		await member.page.goto(`${appUrl}${marlin}/history`);
		const current = member.page.locator('li[data-revision]').first();
		// The demo's thread on Marlin's current revision, shut until opened.
		await current.getByText('Comments (2)').click();
		const thread = current.locator('[data-thread]');
		await thread.getByText(/why the jump to 1\/0/).waitFor();
		await expect(thread.locator('[data-mention]').first().textContent()).resolves.toBe(
			'@Demo Member',
		);
		const box = thread.getByLabel('Add a comment');
		// Typing "@demo c" offers the captain; choosing writes the name in full.
		await box.pressSequentially('@demo c');
		await thread
			.getByRole('group', { name: 'Mention a member' })
			.getByRole('button', { name: '@Demo Captain' })
			.click();
		await expect(box.inputValue()).resolves.toBe('@Demo Captain ');
		await box.pressSequentially('150 A or 200 A on the rear feed fuse?');
		await box.press('Shift+Enter');
		await box.pressSequentially('Asked at <b>the counter</b> https://parts.example.test');
		const text =
			'@Demo Captain 150 A or 200 A on the rear feed fuse?\nAsked at <b>the counter</b> https://parts.example.test';
		await expect(box.inputValue()).resolves.toBe(text);
		// What is typed is kept: a reload brings it back.
		await member.page.reload();
		await member.page.locator('li[data-revision]').first().getByText('Comments (2)').click();
		await expect(
			member.page.locator('li[data-revision]').first().getByLabel('Add a comment').inputValue(),
		).resolves.toBe(text);
		const again = member.page.locator('li[data-revision]').first().locator('[data-thread]');
		await again.getByRole('button', { name: 'Post the comment' }).click();
		await again.getByText('Notified: Demo Captain.').waitFor();
		const posted = again.locator('[data-comment]').last();
		// Plain text: the markup shows as typed, the link is no link, the line break stays.
		await expect(posted.textContent()).resolves.toContain('Asked at <b>the counter</b>');
		await expect(posted.locator('b').count()).resolves.toBe(0);
		await expect(posted.locator('a').count()).resolves.toBe(0);
		await expect(posted.locator('p').last().innerText()).resolves.toContain('fuse?\nAsked at');
		await expect(again.getByLabel('Add a comment').inputValue()).resolves.toBe('');
		await member.screenshot('comments-member-1366');

		const captain = await openBrowser({ viewport: { width: 390, height: 844 } });
		opened.push(captain);
		await signInToTeam(captain, appUrl, DEMO_USERS[0].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
		const bell = captain.page.locator('header [data-notifications]');
		await expect.poll(() => bell.getAttribute('aria-label')).toMatch(/^Notifications, \d+ unread$/);
		await bell.click();
		await captain.page.waitForURL(/\/notifications$/);
		const item = captain.page.locator('[data-notification="unread"]').first();
		await expect(item.textContent()).resolves.toMatch(
			/Demo Member mentioned you on r\d+ of Marlin/,
		);
		await captain.screenshot('comments-notifications-390');
		await item.getByRole('link', { name: /of Marlin/ }).click();
		await captain.page.waitForURL(/\/history\?r=\d+#r\d+$/);
		// The thread of the revision named is open, with the question in it.
		await captain.page.getByText('150 A or 200 A on the rear feed fuse?').waitFor();
		await captain.page.goto(`${appUrl}/notifications`);
		// Opening it read it; the demo's older mentions are still unread.
		await captain.page
			.locator('[data-notification="read"]', { hasText: '150 A or 200 A' })
			.waitFor();
		await captain.page.getByRole('button', { name: 'Mark all read' }).click();
		await captain.page.getByText('Nothing unread.').waitFor();
		await expect.poll(() => bell.getAttribute('aria-label')).toBe('Notifications');
		expect(member.problems).toEqual([]);
		expect(captain.problems).toEqual([]);
	}, 120_000);

	it('the mention was mailed; its link stops such mail without signing in, and can undo it', async () => {
		const mail = await waitForMail(outbox, DEMO_USERS[0].email, { timeoutMs: 10_000 });
		expect(mail.subject).toMatch(/^Demo Member mentioned you on r\d+ of Marlin$/);
		expect(mail.text).toContain('150 A or 200 A on the rear feed fuse?');
		const link = linkIn(mail, '/unsubscribe?token=');
		const anyone = await openBrowser({ viewport: { width: 390, height: 844 } });
		opened.push(anyone);
		await anyone.page.goto(link);
		await anyone.page.getByText('Sagwise no longer mails').waitFor();
		// A token changed by one character is refused.
		const res = await anyone.page.request.get(
			`${link.slice(0, -1)}${link.endsWith('A') ? 'B' : 'A'}`,
		);
		expect(res.status()).toBe(400);
		await anyone.page.getByRole('button', { name: 'Mail me each mention again' }).click();
		await anyone.page.getByText('are mailed as they happen again').waitFor();
		expect(anyone.problems).toEqual([]);
	}, 60_000);
});
