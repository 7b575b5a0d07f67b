import { LRUCache } from 'lru-cache';
import type { ComponentChange } from '@/engine';
import { findRevisionDocuments } from '@/lib/server/db/builds';
import { cacheRequests } from '@/lib/server/metrics';
import { runEngine, type EngineCall } from './pool';

/**
 * What changed between two revisions, kept per pair: revisions never change, so a pair's diff is
 * worked out once per instance (in the engine's pool) and a repeat view of the history costs no
 * engine work and reads no documents. Bounded; a diff is a few hundred bytes.
 */
const cache = new LRUCache<string, ComponentChange[]>({ max: 5000 });

const keyOf = (p: { before: string; after: string }) => `${p.before}>${p.after}`;

export async function revisionPairDiffs(
	db: App.Locals['db'],
	pairs: { before: string; after: string }[],
	call: EngineCall = {},
): Promise<Map<string, ComponentChange[]>> {
	const out = new Map<string, ComponentChange[]>();
	const missing: { before: string; after: string }[] = [];
	for (const p of pairs) {
		const hit = cache.get(keyOf(p));
		cacheRequests.inc({ cache: 'diffs', result: hit ? 'hit' : 'miss' });
		if (hit) out.set(keyOf(p), hit);
		else missing.push(p);
	}
	if (missing.length === 0) return out;
	const docs = await findRevisionDocuments(db, [
		...new Set(missing.flatMap((p) => [p.before, p.after])),
	]);
	const present = missing.filter((p) => docs.has(p.before) && docs.has(p.after));
	const diffs = await runEngine(
		'diffs',
		{ pairs: present.map((p) => ({ before: docs.get(p.before)!, after: docs.get(p.after)! })) },
		call,
	);
	present.forEach((p, i) => {
		cache.set(keyOf(p), diffs[i]!);
		out.set(keyOf(p), diffs[i]!);
	});
	return out;
}

export const pairKey = keyOf;
