import { timingSafeEqual } from 'node:crypto';
import type { APIRoute } from 'astro';
import { z } from '@/lib/zod';
import { problem } from '@/lib/server/http';
import { registry } from '@/lib/server/metrics';
import '@/lib/server/metrics-sources';

const bearer = z
	.string()
	.regex(/^Bearer [\w.~+/=-]{16,200}$/)
	.transform((h) => h.slice('Bearer '.length));

const same = (a: string, b: string) => {
	const x = Buffer.from(a);
	const y = Buffer.from(b);
	return x.length === y.length && timingSafeEqual(x, y);
};

/**
 * The server's Prometheus metrics, for the operator's scraper: `Authorization: Bearer <token>`
 * with the token in `SAGWISE_METRICS_TOKEN`. Without a configured token the route does not exist
 * (404); a wrong or missing token is 401.
 */
export const GET: APIRoute = async ({ request }) => {
	const token = process.env.SAGWISE_METRICS_TOKEN;
	if (!token) return problem(404, 'not_found', 'No such page');
	const sent = bearer.safeParse(request.headers.get('authorization') ?? '');
	if (!sent.success || !same(sent.data, token))
		return problem(
			401,
			'unauthenticated',
			'The metrics need the operator’s bearer token',
			undefined,
			{
				'www-authenticate': 'Bearer realm="metrics"',
			},
		);
	return new Response(await registry.metrics(), {
		headers: { 'content-type': registry.contentType, 'cache-control': 'no-store' },
	});
};
