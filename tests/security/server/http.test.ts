import http from 'node:http';
import { describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_USERS } from '../../../db/seed';
import { HttpSession } from '../../helpers/http-session';

const appUrl = inject('appUrl');
const { hostname, port } = new URL(appUrl);

/** A raw request whose body streams in chunks without a Content-Length, as a hostile client sends it. */
function streamBody(
	path: string,
	totalBytes: number,
	headers: Record<string, string> = {},
): Promise<{ status: number; body: string; sent: number }> {
	return new Promise((resolve, reject) => {
		let sent = 0;
		const req = http.request(
			{
				hostname,
				port,
				path,
				method: 'POST',
				headers: {
					'content-type': 'application/json',
					origin: appUrl,
					'transfer-encoding': 'chunked',
					...headers,
				},
			},
			(res) => {
				let body = '';
				res.on('data', (d) => (body += d));
				res.on('end', () => resolve({ status: res.statusCode ?? 0, body, sent }));
				res.on('error', () => resolve({ status: res.statusCode ?? 0, body, sent }));
				res.on('close', () => resolve({ status: res.statusCode ?? 0, body, sent }));
			},
		);
		// A reset after the answer arrived is fine; a reset before it fails the test (status 0), never hangs it.
		req.on('error', (error) =>
			sent > 0 ? resolve({ status: 0, body: String(error), sent }) : reject(error),
		);
		const chunk = Buffer.alloc(64 * 1024, 0x20);
		const pump = () => {
			while (sent < totalBytes) {
				sent += chunk.length;
				if (!req.write(chunk)) return void req.once('drain', pump);
			}
			req.end();
		};
		req.on('response', () => (sent = Math.max(sent, 1)));
		pump();
	});
}

describe('HTTP hardening of the running server', () => {
	it('sends security headers and a script policy with hashes on pages, and no page breaks under it (checked by the browser tests)', async () => {
		const res = await fetch(`${appUrl}/sign-in`);
		expect(res.status).toBe(200);
		expect(res.headers.get('x-content-type-options')).toBe('nosniff');
		expect(res.headers.get('referrer-policy')).toBe('same-origin');
		expect(res.headers.get('content-security-policy')).toMatch(/frame-ancestors 'none'/);
		const html = await res.text();
		const meta =
			/<meta http-equiv="content-security-policy" content="([^"]+)"/i.exec(html)?.[1] ??
			res.headers.get('content-security-policy')!;
		expect(meta).toMatch(/script-src 'self'( 'sha256-[^']+')+/);
		expect(meta).not.toMatch(/script-src[^;]*'unsafe-inline'/);
		expect(meta).toMatch(/object-src 'none'/);
		// Over plain http there is no HSTS (it would pin a local installation to https).
		expect(res.headers.get('strict-transport-security')).toBeNull();
	});

	it('locks down JSON answers and refuses doubled-slash paths with a plain 404', async () => {
		const health = await fetch(`${appUrl}/api/health`);
		expect(health.headers.get('content-security-policy')).toMatch(/default-src 'none'.*sandbox/);
		for (const path of ['//api/teams', '//api//health', '/api//teams']) {
			const res = await fetch(`${appUrl}${path}`);
			expect(res.status, path).toBe(404);
			expect(res.headers.get('content-type')).toBe('application/problem+json');
		}
	});

	it('cuts off a body past its route limit while it streams, with or without a length, before sign-in and after', async () => {
		// Anonymous, on the sign-up route (2 MB) and the sign-in route (64 KB), no Content-Length.
		const signUp = await streamBody('/api/account/sign-up', 20 * 1024 * 1024);
		expect(signUp.status).toBe(413);
		expect(JSON.parse(signUp.body).code).toBe('too_large');
		const signIn = await streamBody('/api/auth/callback/credentials', 5 * 1024 * 1024, {
			'content-type': 'application/x-www-form-urlencoded',
		});
		expect(signIn.status).toBe(413);
		// A declared length past the limit is refused before a byte is read.
		const declared = await fetch(`${appUrl}/api/account/sign-up`, {
			method: 'POST',
			headers: { 'content-type': 'application/json', origin: appUrl },
			body: new Uint8Array(3 * 1024 * 1024),
		});
		expect(declared.status).toBe(413);

		// Signed in, on a team route.
		const s = new HttpSession(appUrl);
		await s.signInWithPassword(DEMO_USERS[1].email, DEMO_PASSWORD);
		const teams = (await (await s.fetch('/api/teams')).json()) as { id: string }[];
		const cookie = (s as unknown as { cookies: Map<string, string> }).cookies;
		const big = await streamBody(`/api/teams/${teams[0]!.id}/events`, 10 * 1024 * 1024, {
			cookie: [...cookie].map(([k, v]) => `${k}=${v}`).join('; '),
		});
		expect(big.status).toBe(413);
		// The server is still there.
		expect((await fetch(`${appUrl}/api/health`)).status).toBe(200);
	});
});
