import { createHash } from 'node:crypto';
import { statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { brotliCompressSync, constants, gzipSync } from 'node:zlib';
import { LRUCache } from 'lru-cache';
import { APP_VERSION } from '@/lib/version';

/**
 * Engine answers kept in memory, per instance, bounded (LRU, at most 500 answers and 64 MB). A
 * revision never changes, so a report is keyed by what it depends on — the revision and the
 * scenario — and a comparison by the head revision, each plan's id and version, the currency and
 * the scenario. Concurrent misses for one key compute once. A hit goes out already compressed
 * (kept compressed beside it), so reads cost no compression work.
 */
const cache = new LRUCache<string, string, () => Promise<string>>({
	max: 500,
	maxSize: 64 * 1024 * 1024,
	sizeCalculation: (body) => Math.max(1, body.length),
	fetchMethod: (_key, _stale, { context }) => context(),
});

/**
 * The same answers compressed, made once per answer and encoding: a report is read far more often
 * than it is computed, and compressing 80 KB of JSON on every read costs more than finding it.
 */
const encoded = new LRUCache<string, Buffer>({
	max: 1000,
	maxSize: 32 * 1024 * 1024,
	sizeCalculation: (b) => Math.max(1, b.length),
});

/** The encoding to answer with: brotli, then gzip, when the request accepts it (q=0 refuses). */
export function acceptedEncoding(accept: string | null): 'br' | 'gzip' | null {
	const offered = new Map(
		(accept ?? '').split(',').map((part) => {
			const [name, ...params] = part.trim().split(';');
			const q = params.map((p) => /^\s*q\s*=\s*([\d.]+)\s*$/.exec(p)?.[1]).find(Boolean);
			return [name!.trim().toLowerCase(), q === undefined ? 1 : Number(q)] as const;
		}),
	);
	if ((offered.get('br') ?? 0) > 0) return 'br';
	if ((offered.get('gzip') ?? 0) > 0) return 'gzip';
	return null;
}

/** `body` compressed for `encoding`, made once per key and encoding and kept (bounded). */
export function encode(key: string, body: string, encoding: 'br' | 'gzip'): Buffer {
	const k = `${encoding}|${key}`;
	const hit = encoded.get(k);
	if (hit) return hit;
	const raw = Buffer.from(body);
	const out =
		encoding === 'br'
			? brotliCompressSync(raw, {
					params: {
						[constants.BROTLI_PARAM_QUALITY]: 5,
						[constants.BROTLI_PARAM_SIZE_HINT]: raw.length,
					},
				})
			: gzipSync(raw, { level: 6 });
	encoded.set(k, out);
	return out;
}

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

/** The ETag of an answer known by its key: it names the key and this build of the app. */
export const etagOf = (key: string) =>
	`"${createHash('sha256').update(`${BUILD}\n${key}`).digest('base64url').slice(0, 32)}"`;

/** Whether an If-None-Match header names `etag` (or `*`). */
export function matches(ifNoneMatch: string | null, etag: string): boolean {
	if (!ifNoneMatch) return false;
	return ifNoneMatch.split(',').some((t) => {
		const tag = t.trim().replace(/^W\//, '');
		return tag === etag || tag === '*';
	});
}

/**
 * Thrown by a `compute()` that finds its inputs gone or changed since the key was made: nothing is
 * cached, and the request is answered with `answer` (a 404 or 409) instead.
 */
export class ComputeRefused extends Error {
	constructor(readonly answer: () => Response) {
		super('the inputs of a cached engine answer changed while it was computed');
	}
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
	let body: string;
	try {
		body = (await cache.fetch(key, { context: compute })) ?? (await compute());
	} catch (error) {
		if (error instanceof ComputeRefused) return error.answer();
		throw error;
	}
	const encoding =
		body.length >= 1024 ? acceptedEncoding(request.headers.get('accept-encoding')) : null;
	if (encoding)
		return new Response(new Uint8Array(encode(key, body, encoding)), {
			headers: {
				...headers,
				'content-type': 'application/json',
				'content-encoding': encoding,
				vary: 'Accept-Encoding',
			},
		});
	return new Response(body, {
		headers: { ...headers, 'content-type': 'application/json', vary: 'Accept-Encoding' },
	});
}
