import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_USERS } from '../../../db/seed';
import { type IsolatedApp, startIsolatedApp } from '../../helpers/app-server';
import { HttpSession } from '../../helpers/http-session';
import { linkIn, waitForMail } from '../../helpers/mail';
import { listOutbox } from '../../../src/lib/server/dev-outbox';

/** Accounts and sign-in limits on a server of their own, so its counters touch no other test. */
describe('accounts cannot be taken over, and sign-in limits cannot be dodged', () => {
	let app: IsolatedApp;
	let base: string;
	beforeAll(async () => {
		app = await startIsolatedApp(Number(process.env.SAGWISE_TEST_ACCOUNTS_APP_PORT ?? 4397));
		base = app.server.url;
	}, 120_000);
	afterAll(async () => app?.close());

	const json = (body: unknown) => ({
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify(body),
	});
	const signUp = (s: HttpSession, email: string, password: string) =>
		s.fetch('/api/account/sign-up', json({ name: 'Someone', email, password }));
	const askLink = async (s: HttpSession, email: string) =>
		s.fetch('/api/auth/signin/nodemailer', {
			method: 'POST',
			body: new URLSearchParams({ email, csrfToken: await s.csrf(), callbackUrl: `${base}/teams` }),
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
		});
	const mailsTo = (email: string) =>
		listOutbox(app.outboxDir).filter((m) => m.to.includes(email)).length;

	it('drops a password someone else set for an address when its owner first signs in by e-mailed link, and ends the sessions made with it', async () => {
		const victim = `owner.${Date.now()}@sagwise.test`;
		const attacker = new HttpSession(base);
		expect((await signUp(attacker, victim, 'attacker knows this one')).status).toBe(201);
		expect((await attacker.signInWithPassword(victim, 'attacker knows this one')).status).toBe(302);
		expect((await attacker.session())?.user?.email).toBe(victim);

		// The owner of the address signs in by the link mailed to it.
		const owner = new HttpSession(base);
		await askLink(owner, victim);
		const mail = await waitForMail(app.outboxDir, victim);
		await owner.fetch(linkIn(mail, '/api/auth/callback/nodemailer'));
		expect((await owner.session())?.user?.email).toBe(victim);

		// The attacker's session has ended and the password no longer opens the account.
		expect(await attacker.session()).toBeNull();
		const again = new HttpSession(base);
		const res = await again.signInWithPassword(victim, 'attacker knows this one');
		expect(res.headers.get('location')).toMatch(/error=CredentialsSignin/);
		expect(await again.session()).toBeNull();
		// The owner stays signed in.
		expect((await owner.session())?.user?.email).toBe(victim);
	});

	it('a password reset ends every older session and spends every older reset link', async () => {
		const email = `resetter.${Date.now()}@sagwise.test`;
		const first = new HttpSession(base);
		expect((await signUp(first, email, 'the first password')).status).toBe(201);
		await first.signInWithPassword(email, 'the first password');
		const second = new HttpSession(base);
		await second.signInWithPassword(email, 'the first password');
		expect((await second.session())?.user?.email).toBe(email);

		const anon = new HttpSession(base);
		expect((await anon.fetch('/api/account/password-reset', json({ email }))).status).toBe(202);
		const older = await waitForMail(app.outboxDir, email);
		expect((await anon.fetch('/api/account/password-reset', json({ email }))).status).toBe(202);
		const newer = await waitForMail(app.outboxDir, email, { after: 1 });
		const token = (m: typeof older) =>
			new URL(linkIn(m, '/reset-password')).searchParams.get('token')!;
		expect(token(older)).not.toBe(token(newer));

		const done = await anon.fetch(
			'/api/account/password-reset/confirm',
			json({ token: token(newer), password: 'the second password' }),
		);
		expect(done.status).toBe(204);
		expect(await first.session()).toBeNull();
		expect(await second.session()).toBeNull();
		const stale = await anon.fetch(
			'/api/account/password-reset/confirm',
			json({ token: token(older), password: 'a third password!' }),
		);
		expect(stale.status).toBe(410);
		const fresh = new HttpSession(base);
		await fresh.signInWithPassword(email, 'the second password');
		expect((await fresh.session())?.user?.email).toBe(email);
	});

	it('limits reset mails and sign-in link mails per address, answering alike for known and unknown addresses', async () => {
		const known = DEMO_USERS[2].email;
		const unknown = `nobody.${Date.now()}@sagwise.test`;
		for (const email of [known, unknown]) {
			const statuses: number[] = [];
			for (let i = 0; i < 4; i++)
				statuses.push(
					(await new HttpSession(base).fetch('/api/account/password-reset', json({ email })))
						.status,
				);
			expect(statuses).toEqual([202, 202, 202, 429]);
		}
		await new Promise((r) => setTimeout(r, 300));
		expect(mailsTo(unknown)).toBe(0);

		const linkTarget = `links.${Date.now()}@sagwise.test`;
		for (let i = 0; i < 7; i++) await askLink(new HttpSession(base), linkTarget);
		await new Promise((r) => setTimeout(r, 500));
		expect(mailsTo(linkTarget)).toBe(5);
	});

	it('limits sign-ups per address', async () => {
		const email = `signups.${Date.now()}@sagwise.test`;
		const statuses: number[] = [];
		for (let i = 0; i < 4; i++)
			statuses.push((await signUp(new HttpSession(base), email, 'a long enough password')).status);
		expect(statuses).toEqual([201, 409, 409, 429]);
	});

	it('counts password attempts per account whatever the path spelling or body type: after ten failures even the right password is refused', async () => {
		const email = DEMO_USERS[1].email;
		const variants: ((s: HttpSession, password: string) => Promise<Response>)[] = [
			(s, password) => s.signInWithPassword(email, password),
			async (s, password) =>
				s.fetch('/api/auth/callback/credentials/', {
					method: 'POST',
					headers: { 'content-type': 'application/x-www-form-urlencoded' },
					body: new URLSearchParams({
						email: email.toUpperCase(),
						password,
						csrfToken: await s.csrf(),
						callbackUrl: `${base}/teams`,
					}),
				}),
			async (s, password) =>
				s.fetch(
					'/api/auth/callback/credentials',
					json({
						email: ` ${email} `,
						password,
						csrfToken: await s.csrf(),
						callbackUrl: `${base}/teams`,
					}),
				),
			async (s, password) =>
				s.fetch('/api/auth/callback/credentials?x=1', {
					method: 'POST',
					headers: {
						'content-type': 'application/x-www-form-urlencoded',
						'x-forwarded-for': `203.0.113.${Math.floor(Math.random() * 200)}`,
					},
					body: new URLSearchParams({
						email,
						password,
						csrfToken: await s.csrf(),
						callbackUrl: `${base}/teams`,
					}),
				}),
		];
		for (let i = 0; i < 10; i++) {
			const s = new HttpSession(base);
			await variants[i % variants.length]!(s, `wrong ${i}`);
			expect(await s.session()).toBeNull();
		}
		for (const variant of variants) {
			const s = new HttpSession(base);
			const res = await variant(s, DEMO_PASSWORD);
			expect([302, 429]).toContain(res.status);
			expect(await s.session()).toBeNull();
		}
		// A doubled slash is no route at all.
		const doubled = await new HttpSession(base).fetch('//api/auth/callback/credentials', {
			method: 'POST',
			body: 'x',
		});
		expect(doubled.status).toBe(404);
		// Another account from another address is untouched by this account's limit.
		const other = new HttpSession(base);
		await other.signInWithPassword(DEMO_USERS[2].email, DEMO_PASSWORD);
		expect((await other.session())?.user?.email).toBe(DEMO_USERS[2].email);
	});

	it('counts failures per client without trusting X-Forwarded-For from a client that is not a known proxy', async () => {
		let refused = false;
		for (let i = 0; i < 35 && !refused; i++) {
			const s = new HttpSession(base);
			const body = new URLSearchParams({
				email: `spray.${i}@sagwise.test`,
				password: 'guess',
				csrfToken: await s.csrf(),
				callbackUrl: `${base}/teams`,
			});
			const res = await s.fetch('/api/auth/callback/credentials', {
				method: 'POST',
				body,
				headers: {
					'content-type': 'application/x-www-form-urlencoded',
					'x-forwarded-for': `198.51.100.${i}`,
				},
			});
			refused = res.status === 429;
		}
		expect(refused).toBe(true);
		// The right password of a fresh account is refused from this client too, for now.
		const s = new HttpSession(base);
		await s.signInWithPassword(DEMO_USERS[0].email, DEMO_PASSWORD);
		expect(await s.session()).toBeNull();
	});
});
