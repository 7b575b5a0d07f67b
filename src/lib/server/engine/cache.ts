import { createHash } from 'node:crypto';
import { statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { LRUCache } from 'lru-cache';
import { APP_VERSION } from '@/lib/version';

/**
 * Engine answers kept in memory, per instance, bounded (LRU, at most 500 answers and 64 MB). A
 * revision never changes, so a report is keyed by what it depends on — the revision and the
 * scenario — and a comparison by the head revision, each plan's id and version, the currency and
 * the scenario. Concurrent misses for one key compute once.
 */
const cache = new LRUCache<string, string, () => Promise<string>>({
	max: 500,
	maxSize: 64 * 1024 * 1024,
	sizeCalculation: (body) => Math.max(1, body.length),
	fetchMethod: (_key, _stale, { context }) => context(),
});

/** Which build of the engine answered: the app's version and when this build was made. */
const BUILD = (() => {
	try {
		return `${APP_VERSION}-${Math.round(statSync(fileURLToPath(import.meta.url)).mtimeMs)}`;
	} catch {
		return APP_VERSION;
	}
})();

/** A stable text for a key part: objects with their keys sorted. */
export function keyPart(value: unknown): string {
	if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'undefined';
	if (Array.isArray(value)) return `[${value.map(keyPart).join(',')}]`;
	const entries = Object.entries(value as Record<string, unknown>).filter(
		([, v]) => v !== undefined,
	);
	return `{${entries
		.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
		.map(([k, v]) => `${JSON.stringify(k)}:${keyPart(v)}`)
		.join(',')}}`;
}

const etagOf = (key: string) =>
	`"${createHash('sha256').update(`${BUILD}\n${key}`).digest('base64url').slice(0, 32)}"`;

function matches(ifNoneMatch: string | null, etag: string): boolean {
	if (!ifNoneMatch) return false;
	return ifNoneMatch.split(',').some((t) => {
		const tag = t.trim().replace(/^W\//, '');
		return tag === etag || tag === '*';
	});
}

/**
 * Answers engine JSON for `key`: 304 when the client already holds it (the ETag is known without
 * computing anything), the cached text on a hit, and `compute()` once on a miss. Call only after
 * the access check: the key names the data, not who may see it.
 */
export async function cachedEngineJson(
	request: Request,
	key: string,
	compute: () => Promise<string>,
): Promise<Response> {
	const etag = etagOf(key);
	const headers = { etag, 'cache-control': 'private, no-cache' };
	if (matches(request.headers.get('if-none-match'), etag))
		return new Response(null, { status: 304, headers });
	const body = (await cache.fetch(key, { context: compute })) ?? (await compute());
	return new Response(body, { headers: { ...headers, 'content-type': 'application/json' } });
}
