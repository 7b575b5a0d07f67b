import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_TEAM_NAME, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser, signInToTeam } from '../helpers/browser';

const appUrl = inject('appUrl');

describe('team backup in chromium', () => {
	let b: Browser | undefined;
	afterAll(async () => b?.close());

	it('the captain downloads the team backup and restores it as a new team', async () => {
		b = await openBrowser();
		const { page } = b;
		await signInToTeam(b, appUrl, DEMO_USERS[0].email, DEMO_PASSWORD, DEMO_TEAM_NAME);
		const [download] = await Promise.all([
			page.waitForEvent('download'),
			page.getByRole('link', { name: 'Download a backup' }).click(),
		]);
		expect(download.suggestedFilename()).toMatch(
			/^sagwise-harbour-street-sag-club-\d{4}-\d{2}-\d{2}\.json$/,
		);
		const file = await download.path();

		await page.goto(`${appUrl}/teams`);
		const form = page.getByRole('form', { name: 'Restore a team from a backup' });
		await form.getByLabel('Backup file').setInputFiles(file);
		await form.getByLabel('Name for the restored team (optional)').fill('Backup drill');
		await form.getByRole('button', { name: 'Restore as a new team' }).click();
		const done = form.getByRole('status').filter({ hasText: 'is restored' });
		await done.waitFor();
		await expect(done.textContent()).resolves.toMatch(
			/“Backup drill” is restored: 3 vehicles, \d+ revisions, \d+ plans, 5 events, \d+ runs, \d+ files?\. You are its captain; the \d+ other people in the file have a pending invitation/,
		);
		await b.screenshot('team-restored');
		await form.getByRole('link', { name: 'Open the team' }).click();
		await page.getByRole('heading', { name: 'Backup drill' }).waitFor();
		for (const v of ['Pebble', 'Marlin', 'Old Oak'])
			await expect(page.getByRole('link', { name: v, exact: true }).count()).resolves.toBe(1);

		// A file that is not a backup is refused with the reason, and no team is added.
		await page.goto(`${appUrl}/teams`);
		const teamsBefore = await page.getByRole('listitem').count();
		await form.getByLabel('Backup file').setInputFiles({
			name: 'notes.json',
			mimeType: 'application/json',
			buffer: Buffer.from('{"format":"something else"}'),
		});
		await form.getByRole('button', { name: 'Restore as a new team' }).click();
		await form.getByRole('alert').filter({ hasText: 'not a team backup' }).waitFor();
		await page.reload();
		await expect(page.getByRole('listitem').count()).resolves.toBe(teamsBefore);
		// The refused upload's 400 is expected; nothing else may go wrong.
		expect(b.problems.filter((p) => !p.includes('status of 400'))).toEqual([]);
	});
});
