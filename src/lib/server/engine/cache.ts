import { createHash } from 'node:crypto';
import { statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { brotliCompressSync, constants, gzipSync } from 'node:zlib';
import { LRUCache } from 'lru-cache';
import { APP_VERSION } from '@/lib/version';
import { cacheRequests } from '@/lib/server/metrics';
import { EngineBusy, isAbort } from './pool';
import { problem } from '@/lib/server/http';

/**
 * Engine answers kept in memory, per instance, bounded (LRU, at most 500 answers and 64 MB). A
 * revision never changes, so a report is keyed by what it depends on — the revision and the
 * canonical scenario — and a comparison by the head revision, each plan's id and version, the
 * currency and the scenario. Concurrent misses for one key compute once (see {@link shared}). A hit
 * goes out already compressed (kept compressed beside it), so reads cost no compression work.
 */
const cache = new LRUCache<string, string>({
	max: 500,
	maxSize: 64 * 1024 * 1024,
	sizeCalculation: (body) => Math.max(1, body.length),
});

interface Computation<T> {
	promise: Promise<T>;
	controller: AbortController;
	waiters: number;
}

const abortError = () => new DOMException('The caller went away', 'AbortError');

/**
 * Computations under way, by key, each shared by every request that asked for it while it ran.
 * Each waiter counts; when the last one's client goes away, the computation is cancelled (its
 * signal aborts, which takes it out of the engine's line or stops its worker) and forgotten, so a
 * later request starts afresh.
 */
export function sharedComputations<T>(name: string, keep: (key: string, value: T) => void) {
	const underway = new Map<string, Computation<T>>();
	return (key: string, compute: (signal: AbortSignal) => Promise<T>, signal?: AbortSignal) => {
		if (signal?.aborted) return Promise.reject(abortError());
		let c = underway.get(key);
		if (c) cacheRequests.inc({ cache: name, result: 'shared' });
		else {
			cacheRequests.inc({ cache: name, result: 'miss' });
			const controller = new AbortController();
			const made: Computation<T> = {
				controller,
				waiters: 0,
				promise: compute(controller.signal).then((value) => {
					if (!controller.signal.aborted) keep(key, value);
					return value;
				}),
			};
			made.promise
				.finally(() => {
					if (underway.get(key) === made) underway.delete(key);
				})
				.catch(() => undefined);
			underway.set(key, (c = made));
		}
		const computation = c;
		computation.waiters++;
		return new Promise<T>((resolve, reject) => {
			const onAbort = () => {
				computation.waiters--;
				if (computation.waiters === 0) {
					if (underway.get(key) === computation) underway.delete(key);
					computation.controller.abort();
				}
				reject(abortError());
			};
			signal?.addEventListener('abort', onAbort, { once: true });
			computation.promise.then(
				(value) => {
					signal?.removeEventListener('abort', onAbort);
					if (!signal?.aborted) resolve(value);
				},
				(error: unknown) => {
					signal?.removeEventListener('abort', onAbort);
					if (!signal?.aborted) reject(error);
				},
			);
		});
	};
}

const shared = sharedComputations<string>('engine_json', (key, body) => cache.set(key, body));

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
 * computing anything), the cached text on a hit, and `compute()` once on a miss, shared by every
 * request that asks meanwhile. `compute` gets a signal that aborts when every client waiting for
 * it has gone. A full engine line answers 503 with Retry-After. Call only after the access check:
 * the key names the data, not who may see it.
 */
export async function cachedEngineJson(
	request: Request,
	key: string,
	compute: (signal: AbortSignal) => Promise<string>,
): Promise<Response> {
	const etag = etagOf(key);
	const headers = { etag, 'cache-control': 'private, no-cache' };
	if (matches(request.headers.get('if-none-match'), etag))
		return new Response(null, { status: 304, headers });
	let body: string;
	const hit = cache.get(key);
	try {
		if (hit !== undefined) cacheRequests.inc({ cache: 'engine_json', result: 'hit' });
		body = hit ?? (await shared(key, compute, request.signal));
	} catch (error) {
		if (error instanceof ComputeRefused) return error.answer();
		if (error instanceof EngineBusy) return busyAnswer(error);
		// Nobody is listening any more; the status is for the logs.
		if (isAbort(error)) return new Response(null, { status: 499 });
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

/** The answer to a request the engine's line has no room for. */
export const busyAnswer = (error: EngineBusy) =>
	problem(
		503,
		'engine_busy',
		`Sagwise is working through other computations just now. Nothing was lost; try again in ${error.retryAfterS} s.`,
		undefined,
		{ 'retry-after': String(error.retryAfterS) },
	);
