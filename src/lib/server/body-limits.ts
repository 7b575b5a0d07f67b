/**
 * How large a request body each route may send, checked by the HTTP front (src/cli/serve.ts)
 * while the body streams in, before any route reads it, and again by the routes' own readers.
 */
const MB = 1024 * 1024;
const FORM_SLACK = 64 * 1024;

export const BODY_LIMITS: { method: string; path: RegExp; bytes: number }[] = [
	{ method: 'POST', path: /^\/api\/teams\/import$/, bytes: 200 * MB + FORM_SLACK },
	{
		method: 'POST',
		path: /^\/api\/teams\/[^/]+\/runs\/[^/]+\/logger$/,
		bytes: 5 * MB + FORM_SLACK,
	},
	{
		method: 'POST',
		path: /^\/api\/teams\/[^/]+\/runs\/[^/]+\/photos$/,
		bytes: 10 * MB + FORM_SLACK,
	},
	{ method: '*', path: /^\/api\/auth\//, bytes: 64 * 1024 },
];
/** Everything else: JSON bodies and page forms. */
export const DEFAULT_BODY_LIMIT = 2 * MB;

export function bodyLimitFor(method: string, pathname: string): number {
	const path = pathname
		.replace(/\/{2,}/g, '/')
		.replace(/(.)\/+$/, '$1')
		.toLowerCase();
	return (
		BODY_LIMITS.find((l) => (l.method === '*' || l.method === method) && l.path.test(path))
			?.bytes ?? DEFAULT_BODY_LIMIT
	);
}
