import {
	addedFindings,
	buildReport,
	findingKey,
	type BuildDocument,
	comparePlans,
	type PlanCandidate,
	type Scenario,
} from '@/engine';

/**
 * The engine work the server does for a request, answered as JSON text (what the cache keeps and
 * the route sends). Run in a worker thread of the pool, or inline when there is none.
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
		return JSON.stringify(
			addedFindings(a.before ? warningsOf(a.before) : [], warningsOf(a.after), ['danger']).map(
				(w) => ({ key: findingKey(w), message: w.message }),
			),
		);
	},
} satisfies Record<string, (args: never) => string>;

export type EngineTask = keyof typeof ENGINE_TASKS;
export type EngineArgs<T extends EngineTask> = Parameters<(typeof ENGINE_TASKS)[T]>[0];
