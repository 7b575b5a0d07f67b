/**
 * Sign-in against Auth.js from the browser. Like auth-astro/client, but it reports what happened
 * (wrong password, too many attempts) instead of navigating away.
 */
export type SignInOutcome =
	| { ok: true; url: string }
	| { ok: false; reason: 'invalid' | 'rate_limited' | 'error'; message: string };

async function csrfToken(): Promise<string> {
	const res = await fetch('/api/auth/csrf');
	return ((await res.json()) as { csrfToken: string }).csrfToken;
}

async function post(path: string, fields: Record<string, string>): Promise<SignInOutcome> {
	const res = await fetch(path, {
		method: 'POST',
		headers: { 'content-type': 'application/x-www-form-urlencoded', 'X-Auth-Return-Redirect': '1' },
		body: new URLSearchParams({ ...fields, csrfToken: await csrfToken() }),
	});
	if (res.status === 429) {
		const body = (await res.json().catch(() => ({}))) as { detail?: string };
		return {
			ok: false,
			reason: 'rate_limited',
			message: body.detail ?? 'Too many attempts. Wait a minute.',
		};
	}
	if (!res.ok)
		return { ok: false, reason: 'error', message: `Sign-in failed (${res.status}). Try again.` };
	const { url } = (await res.json()) as { url: string };
	const params = new URL(url, window.location.origin).searchParams;
	const error = params.get('error');
	if (params.get('code') === 'rate_limited')
		return {
			ok: false,
			reason: 'rate_limited',
			message: 'Too many failed sign-in attempts. Wait a minute and try again.',
		};
	if (error === 'CredentialsSignin')
		return { ok: false, reason: 'invalid', message: 'Wrong e-mail address or password.' };
	if (error) return { ok: false, reason: 'error', message: 'Sign-in did not work. Try again.' };
	return { ok: true, url };
}

export const signInWithPassword = (email: string, password: string, callbackUrl: string) =>
	post('/api/auth/callback/credentials', { email, password, callbackUrl });

export const requestSignInLink = (email: string, callbackUrl: string) =>
	post('/api/auth/signin/nodemailer', { email, callbackUrl });
