import { buildReport, DEFAULT_SCENARIO, type BuildDocument, type Scenario } from '@/engine/browser';
import type { UnitSystem } from '@/lib/format';

/**
 * Answers about saved revisions, by revision id and what else they depend on: a revision never
 * changes, so every render in this process (each request's server render, above all) shares them.
 * Bounded, least recently used out first.
 */
const bySavedRevision = new Map<string, unknown>();
export function rememberForRevision<T>(key: string, make: () => T): T {
	if (bySavedRevision.has(key)) {
		const hit = bySavedRevision.get(key) as T;
		bySavedRevision.delete(key);
		bySavedRevision.set(key, hit);
		return hit;
	}
	const made = make();
	bySavedRevision.set(key, made);
	if (bySavedRevision.size > 64) bySavedRevision.delete(bySavedRevision.keys().next().value!);
	return made;
}

/** An answer about a saved revision when one is in place (no work). */
export const peekForRevision = <T>(key: string): T | undefined =>
	bySavedRevision.get(key) as T | undefined;

/** Puts an answer about a saved revision in place (the server's page, from the engine's pool). */
export function primeForRevision<T>(key: string, value: T): void {
	bySavedRevision.set(key, value);
	if (bySavedRevision.size > 64) bySavedRevision.delete(bySavedRevision.keys().next().value!);
}

const reportKey = (scenario: Scenario, units: UnitSystem) => `${JSON.stringify(scenario)}|${units}`;

/** Where the build page's server leaves its saved head's report for the first render. */
export const savedReportKey = (revisionId: string, units: UnitSystem) =>
	`report|${revisionId}|${reportKey(DEFAULT_SCENARIO, units)}`;

const onServer = typeof window === 'undefined';

/**
 * The report of a document under a scenario, remembered per document object (an unedited draft is
 * its baseline, so the page as first served solves once) and, for a saved revision's own document,
 * by its id across renders. On the server nothing is solved here: a saved head's report is put in
 * place beforehand by the page, from the engine's pool (null when it is not).
 */
const reports = new WeakMap<BuildDocument, Map<string, ReturnType<typeof buildReport>>>();
export function reportOf(
	doc: BuildDocument,
	scenario: Scenario,
	units: UnitSystem,
	revisionId: string | null,
): ReturnType<typeof buildReport> | null {
	const key = reportKey(scenario, units);
	if (onServer) {
		const k = `report|${revisionId}|${key}`;
		return revisionId && bySavedRevision.has(k)
			? (bySavedRevision.get(k) as ReturnType<typeof buildReport>)
			: null;
	}
	let byKey = reports.get(doc);
	if (!byKey) reports.set(doc, (byKey = new Map()));
	let r = byKey.get(key);
	if (!r) {
		const solve = () => buildReport(doc, scenario, { burpRun: false, units });
		r = revisionId ? rememberForRevision(`report|${revisionId}|${key}`, solve) : solve();
		if (byKey.size >= 8) byKey.delete(byKey.keys().next().value!);
		byKey.set(key, r);
	}
	return r;
}
