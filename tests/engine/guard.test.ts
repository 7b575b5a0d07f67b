import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DEMO_BUILDS } from '../../db/demo/builds';
import * as engine from '../../src/engine';
import { EngineInputError } from '../../src/engine';

/**
 * The engine's public functions handed documents that never met the schema: each either computes
 * (and then no figure is NaN) or says which field is wrong with a typed error. Never a bare
 * exception with a misleading message.
 */

const HOSTILE: unknown[] = [
	Number.NaN,
	Number.POSITIVE_INFINITY,
	Number.NEGATIVE_INFINITY,
	-1,
	0,
	1e308,
	-1e308,
	'',
	'12',
	null,
	undefined,
	{},
	[],
	true,
];

type Path = (string | number)[];

/** Every leaf of a JSON value, with its path. */
function leaves(value: unknown, path: Path = []): Path[] {
	if (Array.isArray(value)) return value.flatMap((v, i) => leaves(v, [...path, i]));
	if (value && typeof value === 'object')
		return Object.entries(value).flatMap(([k, v]) => leaves(v, [...path, k]));
	return [path];
}

function setAt(root: unknown, path: Path, value: unknown) {
	let cur = root as Record<string | number, unknown>;
	for (const key of path.slice(0, -1)) cur = cur[key] as Record<string | number, unknown>;
	const last = path.at(-1)!;
	if (value === undefined) delete cur[last];
	else cur[last] = value;
}

/** A NaN anywhere in a result, with where: the one thing the engine must never hand back. */
function findNaN(value: unknown, path = ''): string | null {
	if (typeof value === 'number') return Number.isNaN(value) ? path || '(result)' : null;
	if (value instanceof Float64Array) return value.some(Number.isNaN) ? path : null;
	if (Array.isArray(value)) {
		for (const [i, v] of value.entries()) {
			const hit = findNaN(v, `${path}.${i}`);
			if (hit) return hit;
		}
		return null;
	}
	if (value && typeof value === 'object') {
		for (const [k, v] of Object.entries(value)) {
			const hit = findNaN(v, `${path}.${k}`);
			if (hit) return hit;
		}
	}
	return null;
}

const AT = { engineRpm: 1500, demand: 1, conductorTempC: 25 };
const CALLS: Array<[string, (doc: engine.BuildDocument) => unknown]> = [
	['solveNetwork', (d) => engine.solveNetwork(d, AT)],
	['buildReport', (d) => engine.buildReport(d, {}, { burpRun: false })],
	['runBurp', (d) => engine.runBurp(d, { ...AT, durationS: 1, stepS: 0.1 })],
	[
		'runSession',
		(d) =>
			engine.runSession(d, {
				...engine.DEFAULT_SESSION,
				burps: 2,
				burpS: 1,
				restS: 2,
				stepS: 0.25,
				restStepS: 1,
			}),
	],
	[
		'engineOffPlayTime',
		(d) =>
			engine.engineOffPlayTime(d, {
				demand: 0.125,
				conductorTempC: 25,
				cutoffV: 11.8,
				stepS: 600,
				maxS: 3600,
			}),
	],
	['speedSweep', (d) => engine.speedSweep(d, {}, [600, 3000])],
	['fixedVoltageBudget', (d) => engine.fixedVoltageBudget(d, { ...engine.DEFAULT_SCENARIO })],
	['toSpiceNetlist', (d) => engine.toSpiceNetlist(d, AT)],
];

/** Runs one public function; answers what happened, failing on anything but a result or a typed error. */
function outcome(
	call: () => unknown,
): { kind: 'result'; value: unknown } | { kind: 'refused'; error: EngineInputError } {
	try {
		return { kind: 'result', value: call() };
	} catch (e) {
		if (e instanceof EngineInputError) return { kind: 'refused', error: e };
		throw new Error(`raw exception: ${e instanceof Error ? e.stack : String(e)}`);
	}
}

describe('the engine given documents that skipped validation', () => {
	const builds = Object.values(DEMO_BUILDS);
	const mutation = fc
		.record({
			build: fc.nat({ max: builds.length - 1 }),
			leaf: fc.nat(),
			value: fc.constantFrom(...HOSTILE),
		})
		.map(({ build, leaf, value }) => {
			const doc = structuredClone(builds[build]!);
			const all = leaves(doc);
			const path = all[leaf % all.length]!;
			setAt(doc, path, value);
			return { doc, path: path.join('.'), value };
		});

	it('computes without NaN or refuses with EngineInputError naming the field', () => {
		fc.assert(
			fc.property(mutation, ({ doc, path }) => {
				for (const [name, call] of CALLS) {
					const r = outcome(() => call(doc));
					if (r.kind === 'refused') {
						expect(r.error.problems.length, name).toBeGreaterThan(0);
						// The field that was broken is among the ones named, or a reference to what it named.
						const paths = r.error.problems.map((p) => p.path);
						const group = path.split('.').slice(0, 2).join('.');
						expect(
							paths.some(
								(p) =>
									p.startsWith(group) ||
									group.startsWith(p) ||
									p === 'nodes' ||
									p.startsWith('nodes') ||
									/\.(from|to|positive|negative)$/.test(p),
							),
							`${name}: ${path} broke, problems name ${paths.join(', ')}`,
						).toBe(true);
					} else if (name === 'buildReport' && (r.value as engine.BuildReport).ok === false) {
						expect((r.value as { issues: unknown[] }).issues.length).toBeGreaterThan(0);
					} else {
						expect(findNaN(r.value), `${name} after ${path} changed`).toBeNull();
					}
				}
			}),
			{ numRuns: 60 },
		);
	});

	it('names the exact field when a number is not a number', () => {
		const doc = structuredClone(builds[0]!);
		(doc.cables[1] as { lengthM: unknown }).lengthM = 'long';
		const r = outcome(() => engine.solveNetwork(doc, AT));
		expect(r.kind).toBe('refused');
		if (r.kind === 'refused')
			expect(r.error.problems[0]).toMatchObject({ path: 'cables.1.lengthM' });
		const report = engine.buildReport(doc);
		expect(report.ok).toBe(false);
		if (!report.ok)
			expect(report.issues[0]).toMatchObject({ code: 'invalid_field', path: 'cables.1.lengthM' });
	});

	it('names a reference to a node that is not there instead of failing inside the solver', () => {
		const doc = structuredClone(builds[0]!);
		doc.cables[0]!.to = 'nowhere';
		const r = outcome(() => engine.runBurp(doc, { ...AT, durationS: 1, stepS: 0.1 }));
		expect(r.kind).toBe('refused');
		if (r.kind === 'refused') expect(r.error.problems.map((p) => p.path)).toContain('cables.0.to');
	});

	it('refuses a time step that is zero or would take millions of steps, naming the option', () => {
		const doc = builds[0]!;
		for (const stepS of [0, -0.01, Number.NaN, 1e-9]) {
			const r = outcome(() => engine.runBurp(doc, { ...AT, durationS: 10, stepS }));
			expect(r.kind, String(stepS)).toBe('refused');
			if (r.kind === 'refused') expect(r.error.problems[0]!.path).toBe('burp.stepS');
		}
		const r = outcome(() => engine.solveNetwork(doc, { ...AT, engineRpm: Number.NaN }));
		expect(r.kind === 'refused' && r.error.problems[0]!.path).toBe('conditions.engineRpm');
	});

	it('refuses a plan document by its place in the list', () => {
		const bad = structuredClone(builds[0]!);
		bad.banks[0]!.unitCapacityAh = -5;
		const r = outcome(() =>
			engine.comparePlans(builds[0]!, [{ id: 'p', name: 'p', document: bad, cost: 0 }]),
		);
		expect(r.kind).toBe('refused');
		if (r.kind === 'refused')
			expect(r.error.problems[0]!.path).toBe('plans.0.document.banks.0.unitCapacityAh');
	});
});
