import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as resetRequest from '../../src/pages/api/account/password-reset';
import * as resetConfirm from '../../src/pages/api/account/password-reset/confirm';
import * as signUp from '../../src/pages/api/account/sign-up';
import { findUserByEmail } from '../../src/lib/server/db/users';
import { verifyPassword } from '../../src/lib/server/passwords';
import { callEndpoint, jsonRequest } from '../helpers/container';
import { localsFor, makeUser } from '../helpers/fixtures';
import { linkIn, startTestMail, type TestMail } from '../helpers/mail';
import { createTestDb, type TestDb } from '../helpers/test-db';

describe('account routes', () => {
	let t: TestDb;
	let mail: TestMail;
	beforeAll(async () => {
		t = await createTestDb();
		mail = await startTestMail();
	});
	afterAll(async () => {
		await mail?.close();
		await t?.drop();
	});
	const call = (module: Parameters<typeof callEndpoint>[0], body: unknown, raw = false) =>
		callEndpoint(module, {
			locals: localsFor(t.db, null, mail.mailer),
			request: raw
				? new Request('http://localhost/x', {
						method: 'POST',
						body: String(body),
						headers: { 'content-type': 'text/plain' },
					})
				: jsonRequest('/x', 'POST', body),
		});

	describe('POST /api/account/sign-up', () => {
		it('creates an account with a scrypt hash, never the password', async () => {
			const res = await call(signUp, {
				name: 'Ada Volt',
				email: 'Ada@Sagwise.test',
				password: 'long enough password',
			});
			expect(res.status).toBe(201);
			const row = await findUserByEmail(t.db, 'ada@sagwise.test');
			expect(row?.passwordHash).toMatch(/^scrypt\$/);
			expect(row?.passwordHash).not.toContain('long enough');
			expect(await verifyPassword('long enough password', row!.passwordHash)).toBe(true);
			expect(await verifyPassword('wrong', row!.passwordHash)).toBe(false);
		});

		it('refuses an address that already has an account with 409 and the field', async () => {
			const res = await call(signUp, {
				name: 'Again',
				email: 'ada@sagwise.test',
				password: 'another long password',
			});
			expect(res.status).toBe(409);
			const body = await res.json();
			expect(body).toMatchObject({ code: 'email_taken', errors: [{ path: 'email' }] });
		});

		it('names each bad field and saves nothing', async () => {
			const res = await call(signUp, { name: '', email: 'not-an-address', password: 'short' });
			expect(res.status).toBe(400);
			const body = await res.json();
			expect(body.errors.map((e: { path: string }) => e.path).sort()).toEqual([
				'email',
				'name',
				'password',
			]);
			expect(await findUserByEmail(t.db, 'not-an-address')).toBeUndefined();
		});

		it('answers 415 when the body is not JSON', async () => {
			expect((await call(signUp, 'name=x', true)).status).toBe(415);
		});
	});

	describe('password reset', () => {
		it('mails a single-use link that sets a new password', async () => {
			const user = await makeUser(t.db, 'reset.me@sagwise.test');
			const res = await call(resetRequest, { email: user.email });
			expect(res.status).toBe(202);
			const message = await mail.waitFor(user.email);
			expect(message.subject).toMatch(/Reset/);
			expect(message.html).toContain('<a href=');
			const token = new URL(linkIn(message, '/reset-password')).searchParams.get('token')!;

			expect((await call(resetConfirm, { token, password: 'a brand new password' })).status).toBe(
				204,
			);
			const row = await findUserByEmail(t.db, user.email);
			expect(await verifyPassword('a brand new password', row!.passwordHash)).toBe(true);

			const again = await call(resetConfirm, { token, password: 'yet another password' });
			expect(again.status).toBe(410);
			expect((await again.json()).code).toBe('token_used');
		});

		it('refuses an expired link', async () => {
			const user = await makeUser(t.db, 'late@sagwise.test');
			await call(resetRequest, { email: user.email });
			const token = new URL(
				linkIn(await mail.waitFor(user.email), '/reset-password'),
			).searchParams.get('token')!;
			await t.db
				.updateTable('password_reset')
				.set({ expires_at: new Date(Date.now() - 1000) })
				.where('user_id', '=', user.id)
				.execute();
			const res = await call(resetConfirm, { token, password: 'a brand new password' });
			expect(res.status).toBe(410);
			expect((await res.json()).code).toBe('token_expired');
		});

		it('refuses an unknown link with 404', async () => {
			const res = await call(resetConfirm, {
				token: 'x'.repeat(43),
				password: 'a brand new password',
			});
			expect(res.status).toBe(404);
		});

		it('answers the same for an unknown address and sends nothing', async () => {
			const res = await call(resetRequest, { email: 'nobody@sagwise.test' });
			expect(res.status).toBe(202);
			await new Promise((r) => setTimeout(r, 200));
			expect(mail.count('nobody@sagwise.test')).toBe(0);
		});
	});
});
