import { LRUCache } from 'lru-cache';
import type { BuildDocument, UnitSystem } from '@/engine';
import { cacheRequests } from '@/lib/server/metrics';
import { sharedComputations } from './cache';
import { runEngine, type EngineCall } from './pool';
import type { RevisionSummaryFigures } from './tasks';

export type { RevisionSummaryFigures };

/**
 * The small answers pages read from a revision's report (headline figures, computed checks),
 * kept per instance: a revision never changes, so they are keyed by the revision, the battery-fuse
 * distance and the reader's units. Bounded; each entry is a few hundred bytes. Worked out in the
 * engine's pool, never on the request thread.
 */
const cache = new LRUCache<string, RevisionSummaryFigures>({ max: 2000 });
const shared = sharedComputations<RevisionSummaryFigures>('figures', (key, value) =>
	cache.set(key, value),
);

/** The figures of a revision when this instance holds them already (no engine work). */
export function cachedRevisionFigures(
	revisionId: string,
	fuseDistanceM: number,
	units: UnitSystem,
): RevisionSummaryFigures | undefined {
	const hit = cache.get(`${revisionId}|${fuseDistanceM}|${units}`);
	if (hit) cacheRequests.inc({ cache: 'figures', result: 'hit' });
	return hit;
}

export async function revisionFigures(
	revision: { id: string; document: BuildDocument },
	fuseDistanceM: number,
	units: UnitSystem,
	call: EngineCall = {},
): Promise<RevisionSummaryFigures> {
	const key = `${revision.id}|${fuseDistanceM}|${units}`;
	const hit = cache.get(key);
	if (hit) {
		cacheRequests.inc({ cache: 'figures', result: 'hit' });
		return hit;
	}
	return shared(
		key,
		(signal) =>
			runEngine(
				'figures',
				{ document: revision.document, fuseDistanceM, units },
				{ team: call.team, signal },
			),
		call.signal,
	);
}
