/**
 * The engine's public surface: everything of `./browser`, the document's schema (its input
 * contract) and each computation wrapped in the input check below.
 */
export * from './browser';
export { documentProblems } from './guard';
export * from './document-schema';

// The public surface: each computation checks what it is handed first (the schema's fields and
// ranges, the topology, the options' ranges) and throws EngineInputError naming the fields, so a
// document that skipped validation never meets a bare exception or yields NaN. The modules call
// one another directly, unchecked: one check per call from outside.
import { assertEngineInput, documentProblems as problemsOf, EngineInputError } from './guard';
import { buildReport as buildReportUnchecked, type BuildReport } from './report';
import { runBurp as runBurpUnchecked } from './burp';
import {
	engineOffPlayTime as engineOffPlayTimeUnchecked,
	runSession as runSessionUnchecked,
} from './session';
import { solveNetwork as solveNetworkUnchecked } from './solve';
import { fixedVoltageBudget as fixedVoltageBudgetUnchecked } from './budget';
import { speedSweep as speedSweepUnchecked } from './sweep';
import { upgradeHints as upgradeHintsUnchecked } from './hints';
import { comparePlans as comparePlansUnchecked } from './compare';
import { toSpiceNetlist as toSpiceNetlistUnchecked } from './spice';
import { traceFeeds as traceFeedsUnchecked } from './feed';

/** A report, or `ok: false` with every problem (a field's path, or the topology's). */
export const buildReport: typeof buildReportUnchecked = (doc, scenario, opts) => {
	const problems = problemsOf(doc);
	if (problems.length > 0)
		return {
			ok: false,
			issues: problems.map((p) => ({ code: 'invalid_field', ...p })),
		} satisfies BuildReport;
	assertEngineInput(doc, { scenario });
	return buildReportUnchecked(doc, scenario, opts);
};
export const solveNetwork: typeof solveNetworkUnchecked = (doc, conditions) => {
	assertEngineInput(doc, { conditions });
	return solveNetworkUnchecked(doc, conditions);
};
export const runBurp: typeof runBurpUnchecked = (doc, opts) => {
	assertEngineInput(doc, { burp: opts });
	return runBurpUnchecked(doc, opts);
};
export const runSession: typeof runSessionUnchecked = (doc, schedule) => {
	assertEngineInput(doc, { schedule });
	return runSessionUnchecked(doc, schedule);
};
export const engineOffPlayTime: typeof engineOffPlayTimeUnchecked = (doc, opts) => {
	assertEngineInput(doc, { playTime: opts });
	return engineOffPlayTimeUnchecked(doc, opts);
};
export const fixedVoltageBudget: typeof fixedVoltageBudgetUnchecked = (doc, opts) => {
	assertEngineInput(doc, { budget: opts });
	return fixedVoltageBudgetUnchecked(doc, opts);
};
export const speedSweep: typeof speedSweepUnchecked = (doc, scenario, rpms) => {
	assertEngineInput(doc, { scenario, rpms: rpms && { engineRpms: rpms } });
	return speedSweepUnchecked(doc, scenario, rpms);
};
export const upgradeHints: typeof upgradeHintsUnchecked = (doc, conditions) => {
	assertEngineInput(doc, { conditions });
	return upgradeHintsUnchecked(doc, conditions);
};
export const comparePlans: typeof comparePlansUnchecked = (current, plans, scenario) => {
	assertEngineInput(current, { scenario });
	plans.forEach((p, i) => {
		const problems = problemsOf(p.document, `plans.${i}.document`);
		if (problems.length > 0) throw new EngineInputError(problems);
	});
	return comparePlansUnchecked(current, plans, scenario);
};
export const toSpiceNetlist: typeof toSpiceNetlistUnchecked = (doc, conditions, opts) => {
	assertEngineInput(doc, { conditions });
	return toSpiceNetlistUnchecked(doc, conditions, opts);
};
export const traceFeeds: typeof traceFeedsUnchecked = (doc, solution) => {
	assertEngineInput(doc);
	return traceFeedsUnchecked(doc, solution);
};
