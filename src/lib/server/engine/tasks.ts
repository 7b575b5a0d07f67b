import {
	addedFindings,
	analyseRun,
	buildReport,
	findingKey,
	type BuildDocument,
	comparePlans,
	computedChecks,
	type ComputedCheck,
	diffBuilds,
	headlineFigures,
	type HeadlineFigures,
	type PlanCandidate,
	type Sample,
	type Scenario,
	type UnitSystem,
} from '@/engine';
import { DEFAULT_SCENARIO } from '@/engine';
import { validateDraft } from '@/lib/client/draft-check';

export interface RevisionSummaryFigures {
	/** Null when the engine cannot solve the build (its issues are in the checks). */
	headline: HeadlineFigures | null;
	checks: ComputedCheck[];
}

/**
 * The engine work the server does for a request. Run in a worker thread of the pool (inline only
 * where there is none): API answers come back as JSON text (what the cache keeps and the route
 * sends), what a page renders from comes back as objects (structured clone keeps every number).
 */
export const ENGINE_TASKS = {
	report: (a: {
		revisionId: string;
		number: number;
		document: BuildDocument;
		scenario: Partial<Scenario>;
	}) =>
		JSON.stringify({
			revisionId: a.revisionId,
			number: a.number,
			report: buildReport(a.document, a.scenario),
		}),
	compare: (a: {
		currency: string;
		head: { id: string; number: number; message: string; document: BuildDocument };
		plans: PlanCandidate[];
		scenario: Partial<Scenario>;
	}) =>
		JSON.stringify({
			currency: a.currency,
			head: { id: a.head.id, number: a.head.number, message: a.head.message },
			columns: comparePlans(a.head.document, a.plans, a.scenario),
		}),
	/** Danger findings `after` has that `before` does not, as the plan comparison names them. */
	addedDangers: (a: { before: BuildDocument | null; after: BuildDocument }) => {
		const warningsOf = (d: BuildDocument) => {
			const r = buildReport(d, {}, { burpRun: false });
			return r.ok ? r.warnings : [];
		};
		return addedFindings(a.before ? warningsOf(a.before) : [], warningsOf(a.after), ['danger']).map(
			(w) => ({ key: findingKey(w), message: w.message }),
		);
	},
	/** The small answers pages read from a revision (headline figures, computed checks). */
	figures: (a: {
		document: BuildDocument;
		fuseDistanceM: number;
		units: UnitSystem;
	}): RevisionSummaryFigures => {
		const report = buildReport(
			a.document,
			{ fuseDistanceM: a.fuseDistanceM },
			{ burpRun: false, units: a.units },
		);
		return {
			headline: report.ok ? headlineFigures(report) : null,
			checks: computedChecks(report, a.units),
		};
	},
	/** What the build page's first render shows of its saved head: the field check and the report. */
	savedHead: (a: { document: BuildDocument; units: UnitSystem }) => {
		const errors = validateDraft(a.document);
		return {
			errors,
			report:
				Object.keys(errors).length === 0
					? buildReport(a.document, DEFAULT_SCENARIO, { burpRun: false, units: a.units })
					: null,
		};
	},
	/** A logger file's analysis. */
	analyseRun: (a: { samples: Sample[] }) => analyseRun(a.samples),
	/** What changed between consecutive revisions, per pair. */
	diffs: (a: { pairs: { before: BuildDocument; after: BuildDocument }[] }) =>
		a.pairs.map((p) => diffBuilds(p.before, p.after)),
} satisfies Record<string, (args: never) => unknown>;

export type EngineTask = keyof typeof ENGINE_TASKS;
export type EngineArgs<T extends EngineTask> = Parameters<(typeof ENGINE_TASKS)[T]>[0];
export type EngineResult<T extends EngineTask> = ReturnType<(typeof ENGINE_TASKS)[T]>;
