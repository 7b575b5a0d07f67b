import type { Amplifier } from './types';

/**
 * Input power an amplifier (all units of it) draws at a demand level:
 * P_in = d · P_rated · quantity / η, where d is the fraction of rated output (1 for a burp,
 * about 1/8 for sustained music).
 */
export function amplifierInputPowerW(amp: Pick<Amplifier, 'ratedPowerW' | 'efficiency' | 'quantity'>, demand: number): number {
	return (demand * amp.ratedPowerW * amp.quantity) / amp.efficiency;
}

/** Supply current at terminal voltage V for a constant-power draw: I = P_in / V (A). */
export function amplifierCurrentA(
	amp: Pick<Amplifier, 'ratedPowerW' | 'efficiency' | 'quantity'>,
	demand: number,
	voltageV: number,
): number {
	return amplifierInputPowerW(amp, demand) / voltageV;
}

/**
 * Output of an unregulated (fixed-ratio converter) amplifier at clipping: rails follow the supply,
 * so P(V) = P_rated · (V / V_rated)².
 */
export function unregulatedOutputW(ratedPowerW: number, ratedVoltageV: number, voltageV: number): number {
	return ratedPowerW * (voltageV / ratedVoltageV) ** 2;
}

/**
 * Output one unit can deliver at its terminal voltage: a regulated supply holds its rating; an
 * unregulated one follows V², capped at its rating (above the rated voltage the protection and
 * the rating, not the rails, are taken as the limit).
 */
export function availableOutputW(amp: Pick<Amplifier, 'ratedPowerW' | 'ratedVoltageV' | 'regulated'>, voltageV: number): number {
	if (amp.regulated) return amp.ratedPowerW;
	return Math.min(amp.ratedPowerW, unregulatedOutputW(amp.ratedPowerW, amp.ratedVoltageV, voltageV));
}

/** Level change for a power ratio: ΔL = 10·log10(P₂/P₁) dB. */
export function powerRatioDb(p2: number, p1: number): number {
	return 10 * Math.log10(p2 / p1);
}

/** Level change for a voltage ratio at fixed load (P ∝ V²): ΔL = 20·log10(V₂/V₁) dB. */
export function voltageRatioDb(v2: number, v1: number): number {
	return 20 * Math.log10(v2 / v1);
}

/** Output lost against the rating at a terminal voltage (dB, ≤ 0). */
export function outputLossDb(amp: Pick<Amplifier, 'ratedPowerW' | 'ratedVoltageV' | 'regulated'>, voltageV: number): number {
	return powerRatioDb(availableOutputW(amp, voltageV), amp.ratedPowerW);
}
