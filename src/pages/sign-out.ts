import type { APIRoute } from 'astro';
import { SESSION_COOKIE } from '@/lib/server/session-cache';

/**
 * Signs out with a plain form (no script): the session cookie is removed and the browser goes home.
 * Astro's same-origin check refuses a form posted from another site, so nobody can sign a member
 * out from elsewhere; sessions are signed tokens, so removing the cookie ends this one.
 */
export const POST: APIRoute = ({ request, url }) => {
	const names = (request.headers.get('cookie') ?? '')
		.split(';')
		.map((c) => c.trim().split('=')[0]!)
		.filter((n) => SESSION_COOKIE.test(n));
	const headers = new Headers({ location: '/', 'cache-control': 'no-store' });
	for (const name of new Set(['authjs.session-token', ...names])) {
		const secure = name.startsWith('__Secure-') || url.protocol === 'https:';
		headers.append(
			'set-cookie',
			`${name}=; Path=/; Max-Age=0; HttpOnly; SameSite=Lax${secure ? '; Secure' : ''}`,
		);
	}
	return new Response(null, { status: 303, headers });
};
