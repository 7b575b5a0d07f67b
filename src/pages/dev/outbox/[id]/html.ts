import type { APIRoute } from 'astro';
import { findOutboxMail } from '@/lib/server/dev-outbox';
import { problem } from '@/lib/server/http';

/**
 * A caught mail's HTML on its own, for the outbox page's frame. Mail HTML carries inline styles
 * that the app's page policy forbids, so it gets a policy of its own: styles and images only, no
 * script, sandboxed, framed only by the app itself.
 */
export const GET: APIRoute = ({ params, locals }) => {
	const dir = locals.config.devOutboxDir;
	const mail = dir ? findOutboxMail(dir, params.id ?? '') : null;
	if (!mail) return problem(404, 'not_found', 'No such mail');
	return new Response(mail.html, {
		headers: {
			'content-type': 'text/html; charset=utf-8',
			'content-security-policy':
				"default-src 'none'; style-src 'unsafe-inline'; img-src data:; frame-ancestors 'self'; sandbox",
			'x-frame-options': 'SAMEORIGIN',
			'cache-control': 'no-store',
		},
	});
};
