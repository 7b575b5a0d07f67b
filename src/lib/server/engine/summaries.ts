import { LRUCache } from 'lru-cache';
import {
	buildReport,
	type BuildDocument,
	computedChecks,
	type ComputedCheck,
	headlineFigures,
	type HeadlineFigures,
	type UnitSystem,
} from '@/engine';

export interface RevisionSummaryFigures {
	/** Null when the engine cannot solve the build (its issues are in the checks). */
	headline: HeadlineFigures | null;
	checks: ComputedCheck[];
}

/**
 * The small answers pages read from a revision's report (headline figures, computed checks),
 * kept per instance: a revision never changes, so they are keyed by the revision, the battery-fuse
 * distance and the reader's units. Bounded; each entry is a few hundred bytes.
 */
const cache = new LRUCache<string, RevisionSummaryFigures>({ max: 2000 });

/** The figures of a revision when this instance holds them already (no engine work). */
export function cachedRevisionFigures(
	revisionId: string,
	fuseDistanceM: number,
	units: UnitSystem,
): RevisionSummaryFigures | undefined {
	return cache.get(`${revisionId}|${fuseDistanceM}|${units}`);
}

export function revisionFigures(
	revision: { id: string; document: BuildDocument },
	fuseDistanceM: number,
	units: UnitSystem,
): RevisionSummaryFigures {
	const key = `${revision.id}|${fuseDistanceM}|${units}`;
	const hit = cache.get(key);
	if (hit) return hit;
	const report = buildReport(revision.document, { fuseDistanceM }, { burpRun: false, units });
	const figures = {
		headline: report.ok ? headlineFigures(report) : null,
		checks: computedChecks(report, units),
	};
	cache.set(key, figures);
	return figures;
}
