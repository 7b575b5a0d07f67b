import { DEFAULT_SCENARIO, type Scenario } from '@/engine/browser';

/**
 * The step each condition moves in, as the conditions form offers it. A server answer is computed
 * for, and cached under, the conditions rounded to these steps (and with values equal to the
 * defaults left out), so `engineRpm=1500`, `engineRpm=1499.9` and no `engineRpm` at all are one
 * answer, and a caller cannot make every request a new computation by nudging a decimal.
 */
export const SCENARIO_STEPS = {
	engineRpm: 100,
	sustainedDemand: 0.01,
	burpDemand: 0.05,
	conductorTempC: 5,
	dropTargetV: 0.05,
	voltagesV: 0.1,
	burpSeconds: 0.5,
	burpStepS: 0.001,
	fuseDistanceM: 0.01,
} as const satisfies Partial<Record<keyof Scenario, number>>;

const toStep = (value: number, step: number) => {
	const n = Math.round(value / step) * step;
	// Printed the way the step is written (no 0.30000000000000004).
	const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
	return Number(n.toFixed(decimals));
};

type StepKey = keyof typeof SCENARIO_STEPS;

/**
 * The canonical form of a scenario's overrides: each value on its step, clamped to a step of at
 * least one (a value that rounds to zero where zero means nothing stays at its least step), voltages
 * sorted and deduplicated, and anything equal to the default left out.
 */
export function canonicalScenario(input: Partial<Scenario>): Partial<Scenario> {
	const out: Partial<Record<keyof Scenario, unknown>> = {};
	for (const [k, v] of Object.entries(input) as [keyof Scenario, unknown][]) {
		if (v === undefined) continue;
		let value: unknown = v;
		if (k === 'voltagesV' && Array.isArray(v)) {
			value = [...new Set((v as number[]).map((x) => toStep(x, SCENARIO_STEPS.voltagesV)))].sort(
				(a, b) => a - b,
			);
		} else if (typeof v === 'number' && k in SCENARIO_STEPS) {
			const step = SCENARIO_STEPS[k as StepKey];
			value = toStep(v, step);
			// A level or a length rounded to nothing keeps its least step (zero means something else).
			if (value === 0 && k !== 'engineRpm' && k !== 'conductorTempC' && v > 0) value = step;
		}
		const fallback = DEFAULT_SCENARIO[k];
		if (JSON.stringify(value) === JSON.stringify(fallback)) continue;
		out[k] = value;
	}
	return out as Partial<Scenario>;
}
