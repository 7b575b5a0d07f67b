import { defineMiddleware } from 'astro:middleware';
import { LRUCache } from 'lru-cache';
import { parseUuid } from '@/lib/schemas/ids';
import { findMembership } from '@/lib/server/db/teams';
import { acceptedEncoding, encode, etagOf, matches } from '@/lib/server/engine/cache';

/**
 * Server-rendered pages that are read far more often than what they show changes: the team page
 * and a vehicle's build page. Each is kept per instance, in memory, bounded, under everything its
 * HTML depends on — the path, the reader (id, name, address, role, units) and the team's data
 * version, which the database bumps in the same commit as any change those pages read (see the
 * team_data_version migration). The one membership query that also checks the reader is still in
 * the team tells whether a kept page is current, whichever instance wrote last; nothing kept is
 * served to anyone but the reader it was made for.
 *
 * The team page also says how long ago things happened and which events are still to come, so its
 * key carries the minute as well.
 */
const PAGES: Array<{ path: RegExp; byMinute: boolean }> = [
	{ path: /^\/teams\/([^/]+)$/, byMinute: true },
	{ path: /^\/teams\/([^/]+)\/vehicles\/([^/]+)$/, byMinute: false },
];

interface KeptPage {
	body: string;
	headers: Array<[string, string]>;
}

const kept = new LRUCache<string, KeptPage>({
	max: 500,
	maxSize: 48 * 1024 * 1024,
	sizeCalculation: (p) => Math.max(1, p.body.length),
});

function answer(request: Request, key: string, page: KeptPage): Response {
	const etag = etagOf(key);
	const headers = new Headers(page.headers);
	headers.set('etag', etag);
	headers.set('cache-control', 'private, no-cache');
	headers.append('vary', 'Accept-Encoding');
	if (matches(request.headers.get('if-none-match'), etag))
		return new Response(null, { status: 304, headers });
	const encoding =
		page.body.length >= 1024 ? acceptedEncoding(request.headers.get('accept-encoding')) : null;
	if (!encoding) return new Response(page.body, { headers });
	headers.set('content-encoding', encoding);
	return new Response(new Uint8Array(encode(key, page.body, encoding)), { headers });
}

/**
 * An HTML page as one body rather than the many small pieces it is rendered in: the compressor and
 * the socket then each take it in one write instead of hundreds.
 */
async function whole(response: Response): Promise<Response> {
	if (
		response.status !== 200 ||
		!(response.headers.get('content-type') ?? '').includes('text/html')
	)
		return response;
	return new Response(await response.text(), { status: 200, headers: response.headers });
}

/** The page cache, as a middleware after the user is known; `normalPath` folds the path. */
export function pageCache(normalPath: (pathname: string) => string) {
	return defineMiddleware(async (context, next) => {
		const user = context.locals.user;
		if (context.request.method !== 'GET' || !user) return next();
		if (context.url.search) return whole(await next());
		const path = normalPath(context.url.pathname);
		const page = PAGES.find((p) => p.path.test(path));
		const teamId = page ? parseUuid(page.path.exec(path)![1]) : null;
		if (!page || !teamId) return next();
		let membership: Awaited<ReturnType<typeof findMembership>>;
		try {
			membership = await findMembership(context.locals.db, teamId, user.id);
		} catch {
			// The page itself meets the same failure and answers it the usual way.
			return next();
		}
		if (!membership) return next();
		const key = [
			'page',
			context.url.host,
			context.url.pathname,
			user.id,
			user.email,
			user.name ?? '',
			membership.role,
			membership.unitSystem,
			membership.data_version,
			page.byMinute ? Math.floor(Date.now() / 60_000) : '',
		].join('|');
		const hit = kept.get(key);
		if (hit) return answer(context.request, key, hit);
		const response = await next();
		const type = response.headers.get('content-type') ?? '';
		if (
			response.status !== 200 ||
			!type.includes('text/html') ||
			response.headers.has('set-cookie')
		)
			return response;
		const made: KeptPage = {
			body: await response.text(),
			headers: [...response.headers].filter(([name]) => name !== 'content-length'),
		};
		kept.set(key, made);
		return answer(context.request, key, made);
	});
}
