// Every finding rule run over every part it is about: the report's findings, in a short loop.
import {
	type AnyFindingRule,
	FINDING_RULES,
	type FindingContext,
	type FindingRule,
	type RuleSubject,
	type Subjects,
} from './finding-rules';
import type { ReportWarning } from './report-types';

/** The parts of one kind a report holds, each with its id and what its rules read. */
export type FindingSubjects = {
	[K in RuleSubject]: Array<{ id: string; subject: Subjects[K] }>;
};

const rulesAbout = (about: RuleSubject) =>
	(FINDING_RULES as readonly AnyFindingRule[]).filter((r) => r.about === about);
const RULES_BY_SUBJECT = {
	build: rulesAbout('build'),
	cable: rulesAbout('cable'),
	amplifier: rulesAbout('amplifier'),
	bank: rulesAbout('bank'),
	alternator: rulesAbout('alternator'),
	capacitor: rulesAbout('capacitor'),
	charger: rulesAbout('charger'),
} satisfies Record<RuleSubject, AnyFindingRule[]>;

/** Every finding, part by part (the build's own first), each part's in the table's order. */
export function evaluateFindings(ctx: FindingContext, subjects: FindingSubjects): ReportWarning[] {
	const warnings: ReportWarning[] = [];
	for (const about of [
		'build',
		'cable',
		'amplifier',
		'bank',
		'alternator',
		'capacitor',
		'charger',
	] as const) {
		const rules = RULES_BY_SUBJECT[about] as FindingRule<typeof about>[];
		for (const { id, subject } of subjects[about] as Array<{ id: string; subject: never }>)
			for (const r of rules)
				for (const message of r.test(subject, ctx))
					warnings.push({
						code: r.code,
						severity: r.severity,
						safety: r.safety,
						element: { kind: about, id },
						message,
					});
	}
	return warnings;
}
