import { describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_USERS } from '../../db/seed';
import { HttpSession } from '../helpers/http-session';
import { linkIn, waitForMail } from '../helpers/mail';

const appUrl = inject('appUrl');
const outbox = inject('outboxDir');
const captain = DEMO_USERS[0].email;

describe('sign-in against the running app (Auth.js)', () => {
	it('signs in with e-mail and password; the session carries the user id', async () => {
		const s = new HttpSession(appUrl);
		const res = await s.signInWithPassword(captain, DEMO_PASSWORD);
		expect(res.status).toBe(302);
		expect(res.headers.get('location')).toBe(`${appUrl}/teams`);
		const session = await s.session();
		expect(session?.user?.email).toBe(captain);
		expect(session?.user?.id).toMatch(/^[0-9a-f-]{36}$/);
		expect((await s.fetch('/teams')).status).toBe(200);
	});

	it('refuses a wrong password with a clear error and no session', async () => {
		const s = new HttpSession(appUrl);
		const res = await s.signInWithPassword(DEMO_USERS[2].email, 'not the password');
		expect(res.headers.get('location')).toMatch(/error=CredentialsSignin/);
		expect(await s.session()).toBeNull();
	});

	it('sends anonymous visitors of app pages to the sign-in page', async () => {
		const res = await new HttpSession(appUrl).fetch('/teams');
		expect(res.status).toBe(302);
		expect(res.headers.get('location')).toBe('/sign-in?callbackUrl=%2Fteams');
	});

	it('signs in with a one-time e-mail link that works once', async () => {
		const s = new HttpSession(appUrl);
		const email = DEMO_USERS[1].email;
		const body = new URLSearchParams({
			email,
			csrfToken: await s.csrf(),
			callbackUrl: `${appUrl}/teams`,
		});
		const res = await s.fetch('/api/auth/signin/nodemailer', {
			method: 'POST',
			body,
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
		});
		expect(res.status).toBe(302);
		const mail = await waitForMail(outbox, email);
		expect(mail.subject).toMatch(/sign-in link/);
		const link = linkIn(mail, '/api/auth/callback/nodemailer');
		const follow = await s.fetch(link);
		expect(follow.status).toBe(302);
		expect((await s.session())?.user?.email).toBe(email);

		const again = await new HttpSession(appUrl).fetch(link);
		expect(again.headers.get('location')).toMatch(/error=Verification/);
	});

	it('refuses the 11th wrong password for one address within a minute with 429', async () => {
		const target = 'rate.limit.target@sagwise.test';
		const statuses: number[] = [];
		for (let i = 0; i < 11; i++) {
			const s = new HttpSession(appUrl);
			statuses.push((await s.signInWithPassword(target, `wrong ${i}`)).status);
		}
		expect(statuses.slice(0, 10).every((x) => x === 302)).toBe(true);
		expect(statuses[10]).toBe(429);
		// Another address is not affected.
		expect(
			(await new HttpSession(appUrl).signInWithPassword(DEMO_USERS[2].email, DEMO_PASSWORD)).status,
		).toBe(302);
	});
});
