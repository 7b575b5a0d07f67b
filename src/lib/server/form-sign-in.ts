import { Auth } from '@auth/core';
import authConfig from 'auth:config';

export type FormSignInResult =
	| { ok: true; location: string; setCookies: string[] }
	| { ok: false; error: 'CredentialsSignin' | 'rate_limited' | 'error' };

/**
 * Password sign-in for a plain form post (a page served before its script ran): the same Auth.js
 * flow the script uses (CSRF token, credentials callback), run inside the server, so the session
 * cookie, the attempt counting and the limits are exactly those of a scripted sign-in.
 */
export async function signInFromForm(
	request: Request,
	email: string,
	password: string,
	callbackUrl: string,
): Promise<FormSignInResult> {
	const origin = new URL(request.url).origin;
	const base = authConfig.prefix ?? '/api/auth';
	const forward = new Headers();
	for (const name of ['user-agent', 'x-forwarded-for', 'x-forwarded-proto', 'x-forwarded-host']) {
		const v = request.headers.get(name);
		if (v) forward.set(name, v);
	}
	const csrf = await Auth(new Request(`${origin}${base}/csrf`, { headers: forward }), authConfig);
	const { csrfToken } = (await csrf.json()) as { csrfToken: string };
	const csrfCookies = csrf.headers.getSetCookie().map((c) => c.split(';')[0]!);
	const headers = new Headers(forward);
	headers.set('content-type', 'application/x-www-form-urlencoded');
	headers.set('cookie', csrfCookies.join('; '));
	headers.set('origin', origin);
	let res: Response;
	try {
		res = await Auth(
			new Request(`${origin}${base}/callback/credentials`, {
				method: 'POST',
				headers,
				body: new URLSearchParams({ email, password, csrfToken, callbackUrl }),
			}),
			authConfig,
		);
	} catch {
		return { ok: false, error: 'error' };
	}
	const location = res.headers.get('location') ?? '';
	const url = new URL(location || '/', origin);
	const error = url.searchParams.get('error');
	if (error)
		return {
			ok: false,
			error:
				url.searchParams.get('code') === 'rate_limited'
					? 'rate_limited'
					: error === 'CredentialsSignin'
						? 'CredentialsSignin'
						: 'error',
		};
	return {
		ok: true,
		location: url.origin === origin ? url.pathname + url.search : '/teams',
		setCookies: res.headers.getSetCookie(),
	};
}
