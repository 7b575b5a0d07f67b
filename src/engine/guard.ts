import * as z from 'zod/mini';
import { buildDocumentSchema } from './document-schema';
import { checkTopology } from './topology';
import type { BuildDocument } from './types';
import { EngineInputError, type EngineProblem } from './errors';

export { EngineInputError, type EngineProblem };

const finite = (what: string, min: number, max: number) =>
	z
		.number({ error: `${what} must be a number` })
		.check(
			z.gte(min, `${what} must be at least ${min}`),
			z.lte(max, `${what} must be at most ${max}`),
		);
const seconds = (what: string) =>
	z
		.number({ error: `${what} must be a number` })
		.check(
			z.positive(`${what} must be more than zero`),
			z.lte(7 * 86_400, `${what} must be at most a week`),
		);
const demand = (what: string) => finite(what, 0, 100);

/**
 * The options every engine function takes (conditions, scenario, schedule) share their names:
 * one set of ranges for all of them. Unknown keys pass; the functions ignore them.
 */
const optionsSchema = z.looseObject({
	engineRpm: z.optional(finite('Engine speed', 0, 100_000)),
	engineRpms: z.optional(z.array(finite('Engine speed', 0, 100_000)).check(z.maxLength(1000))),
	demand: z.optional(demand('Demand')),
	sustainedDemand: z.optional(demand('Music demand')),
	burpDemand: z.optional(demand('Burp demand')),
	restDemand: z.optional(demand('Rest demand')),
	conductorTempC: z.optional(finite('Conductor temperature', -80, 400)),
	voltagesV: z.optional(z.array(finite('Supply voltage', 0.1, 100)).check(z.maxLength(50))),
	dropTargetV: z.optional(finite('Drop target', 0, 100)),
	cutoffV: z.optional(z.nullable(finite('Cut-off voltage', 0, 100))),
	fuseDistanceM: z.optional(finite('Fuse distance', 0, 1000)),
	burpSeconds: z.optional(seconds('Burp length')),
	burpStepS: z.optional(seconds('Burp step')),
	durationS: z.optional(seconds('Duration')),
	stepS: z.optional(seconds('Step')),
	restStepS: z.optional(seconds('Rest step')),
	burpS: z.optional(seconds('Burp length')),
	restS: z.optional(finite('Rest', 0, 7 * 86_400)),
	maxS: z.optional(seconds('Longest time')),
	burps: z.optional(z.number().check(z.int('Burps must be a whole number'), z.gte(0), z.lte(1000))),
	stateOfCharge: z.optional(z.record(z.string(), finite('State of charge', 0, 1))),
});

/** Most time steps one run may take: beyond this a step is too small for the time asked. */
const MAX_STEPS = 2_000_000;

function toProblems(issues: readonly z.core.$ZodIssue[], prefix: string): EngineProblem[] {
	return issues.map((i) => ({
		path: [prefix, ...i.path.map(String)].filter(Boolean).join('.'),
		message: i.message,
	}));
}

/** Everything wrong with a document the engine is handed: fields (the schema), then topology. */
export function documentProblems(doc: unknown, prefix = ''): EngineProblem[] {
	const parsed = buildDocumentSchema.safeParse(doc);
	if (!parsed.success) return toProblems(parsed.error.issues, prefix);
	return checkTopology(parsed.data).map((t) => ({
		path: [prefix, t.path].filter(Boolean).join('.'),
		message: t.message,
	}));
}

/** Everything wrong with an options object (conditions, scenario or schedule). */
export function optionsProblems(options: unknown, name: string): EngineProblem[] {
	if (options === undefined) return [];
	const parsed = optionsSchema.safeParse(options);
	if (!parsed.success) return toProblems(parsed.error.issues, name);
	const o = parsed.data;
	const problems: EngineProblem[] = [];
	const steps = (duration: number | undefined, step: number | undefined, key: string) => {
		if (duration !== undefined && step !== undefined && duration / step > MAX_STEPS)
			problems.push({
				path: `${name}.${key}`,
				message: `A step this small would take more than ${MAX_STEPS.toLocaleString('en')} steps`,
			});
	};
	steps(o.durationS, o.stepS, 'stepS');
	steps(o.burpSeconds, o.burpStepS, 'burpStepS');
	steps(o.burpS !== undefined ? o.burpS * (o.burps ?? 1) : undefined, o.stepS, 'stepS');
	steps(o.restS !== undefined ? o.restS * (o.burps ?? 1) : undefined, o.restStepS, 'restStepS');
	steps(o.maxS, o.stepS, 'stepS');
	return problems;
}

/** Throws EngineInputError naming every bad field unless `doc` is a solvable build document. */
export function assertEngineInput(
	doc: unknown,
	options: Record<string, unknown> = {},
): asserts doc is BuildDocument {
	const problems = [
		...documentProblems(doc),
		...Object.entries(options).flatMap(([name, value]) => optionsProblems(value, name)),
	];
	if (problems.length > 0) throw new EngineInputError(problems);
}
