import type { Alternator, CurvePoint } from './types';

/**
 * Default output shape as a fraction of the rated hot output against alternator shaft speed:
 * nothing below cut-in (~1000 rpm), a steep rise, saturation toward the rating by 6000 rpm.
 * Common practice, no published source; teams should enter their unit's own curve.
 */
export const DEFAULT_CURVE_SHAPE: readonly CurvePoint[] = [
	{ rpm: 0, currentA: 0 },
	{ rpm: 1000, currentA: 0 },
	{ rpm: 1500, currentA: 0.45 },
	{ rpm: 2000, currentA: 0.65 },
	{ rpm: 3000, currentA: 0.85 },
	{ rpm: 4000, currentA: 0.93 },
	{ rpm: 5000, currentA: 0.97 },
	{ rpm: 6000, currentA: 1 },
];

/** Alternator shaft speed from engine speed: n_alt = n_engine × (D_crank / D_alt). */
export function alternatorRpm(engineRpm: number, pulleyRatio: number): number {
	return engineRpm * pulleyRatio;
}

function interpolate(curve: readonly CurvePoint[], rpm: number): number {
	if (curve.length === 0) return 0;
	const sorted = [...curve].sort((a, b) => a.rpm - b.rpm);
	if (rpm <= sorted[0]!.rpm)
		return sorted[0]!.rpm === 0 || rpm === sorted[0]!.rpm ? sorted[0]!.currentA : 0;
	for (let i = 1; i < sorted.length; i++) {
		const b = sorted[i]!;
		const a = sorted[i - 1]!;
		if (rpm <= b.rpm)
			return a.currentA + ((b.currentA - a.currentA) * (rpm - a.rpm)) / (b.rpm - a.rpm);
	}
	return sorted[sorted.length - 1]!.currentA;
}

/**
 * Hot output limit (A) at an engine speed: the curve (or the default shape scaled to the rated
 * hot output) at engine rpm × pulley ratio, derated by hotFactor when the curve was taken cold.
 * Below the first curve point the output is zero (not yet cut in); above the last it holds.
 */
export function alternatorLimitA(alt: Alternator, engineRpm: number): number {
	if (engineRpm <= 0) return 0;
	const rpm = alternatorRpm(engineRpm, alt.pulleyRatio);
	if (alt.curve.length === 0) return alt.ratedHotA * interpolate(DEFAULT_CURVE_SHAPE, rpm);
	const raw = interpolate(alt.curve, rpm);
	return alt.curveIsCold ? raw * alt.hotFactor : raw;
}
