import type { ReportWarning, Severity } from './report';

/**
 * The findings of a build, in one order and one count for every view (the summary strip, the
 * findings list, the part tables, the inspector, the checks sheet, the plan comparison): danger
 * first, then warnings, then notes, each group in the report's own order.
 */
const RANK: Record<Severity, number> = { danger: 0, warning: 1, info: 2 };

/** A finding's identity across two reports: what it is and which part it is on. */
export const findingKey = (w: Pick<ReportWarning, 'code' | 'element'>): string =>
	`${w.code}|${w.element.kind}|${w.element.id}`;

/** Every finding, danger first (a stable sort keeps the report's order within a severity). */
export function orderedFindings(warnings: readonly ReportWarning[]): ReportWarning[] {
	return [...warnings].sort((a, b) => RANK[a.severity] - RANK[b.severity]);
}

/** How many findings of each severity: the counts the strip and the comparison show. */
export function findingCounts(warnings: readonly ReportWarning[]): Record<Severity, number> {
	const counts: Record<Severity, number> = { danger: 0, warning: 0, info: 0 };
	for (const w of warnings) counts[w.severity]++;
	return counts;
}

/** Findings in `after` that `before` does not have (same code on the same part), at the severities asked. */
export function addedFindings(
	before: readonly ReportWarning[] | null,
	after: readonly ReportWarning[],
	severities: readonly Severity[] = ['danger', 'warning'],
): ReportWarning[] {
	const had = new Set((before ?? []).map(findingKey));
	return after.filter((w) => severities.includes(w.severity) && !had.has(findingKey(w)));
}
