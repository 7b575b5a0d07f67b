import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_USERS } from '../../db/seed';
import { type Browser, openBrowser } from '../helpers/browser';

const appUrl = inject('appUrl');

describe('the sign-in form wakes on use, in chromium', () => {
	let b: Browser | undefined;
	afterAll(async () => b?.close());

	it('loads no framework until touched, and keeps what was typed before it woke', async () => {
		b = await openBrowser();
		const p = b.page;
		const scripts: string[] = [];
		p.on('response', (r) => {
			if ((r.headers()['content-type'] ?? '').includes('javascript')) scripts.push(r.url());
		});
		await p.goto(`${appUrl}/sign-in`);
		await p.waitForLoadState('networkidle');
		// The sign-in form's island (and React) has not come down yet.
		expect(scripts.some((u) => /SignInForm|client\.[\w-]+\.js/.test(u))).toBe(false);
		// Typed straight in, then Enter: keystrokes before the island is live are not lost.
		await p.getByLabel('E-mail').pressSequentially(DEMO_USERS[0].email, { delay: 0 });
		await p.getByLabel('Password').pressSequentially(DEMO_PASSWORD, { delay: 0 });
		await p.getByLabel('Password').press('Enter');
		await p.waitForURL(`${appUrl}/teams`);
		expect(scripts.some((u) => /SignInForm/.test(u))).toBe(true);
		expect(b.problems).toEqual([]);
	});

	it('holds a click on the mode switch made before the island woke, and does it after', async () => {
		await b?.close();
		b = await openBrowser();
		const p = b.page;
		await p.goto(`${appUrl}/sign-in`);
		await p.getByRole('radio', { name: 'E-mail me a link' }).click();
		await p.getByRole('button', { name: 'Send the link' }).waitFor();
		await expect(p.getByLabel('Password').count()).resolves.toBe(0);
	});
});
