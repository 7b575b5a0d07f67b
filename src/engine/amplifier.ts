import type { Amplifier } from './types';

/**
 * Input power an amplifier (all units of it) draws at a demand level:
 * P_in = d · P_rated · quantity / η, where d is the fraction of rated output (1 for a burp,
 * about 1/8 for sustained music).
 */
export function amplifierInputPowerW(
	amp: Pick<Amplifier, 'ratedPowerW' | 'efficiency' | 'quantity'>,
	demand: number,
): number {
	return (demand * amp.ratedPowerW * amp.quantity) / amp.efficiency;
}

/**
 * Output of an unregulated (fixed-ratio converter) amplifier at clipping: rails follow the supply,
 * so P(V) = P_rated · (V / V_rated)².
 */
export function unregulatedOutputW(
	ratedPowerW: number,
	ratedVoltageV: number,
	voltageV: number,
): number {
	return ratedPowerW * (voltageV / ratedVoltageV) ** 2;
}

/**
 * Output one unit can deliver at its terminal voltage: a regulated supply holds its rating; an
 * unregulated one follows P_rated·(V/V_rated)² on both sides of its rated voltage, up to the
 * stated maximum output when one is given.
 */
export function availableOutputW(
	amp: Pick<Amplifier, 'ratedPowerW' | 'ratedVoltageV' | 'regulated' | 'maxOutputW'>,
	voltageV: number,
): number {
	if (amp.regulated) return amp.ratedPowerW;
	return Math.min(
		amp.maxOutputW ?? Number.POSITIVE_INFINITY,
		unregulatedOutputW(amp.ratedPowerW, amp.ratedVoltageV, voltageV),
	);
}

/**
 * How an amplifier's draw depends on its terminal voltage, for the solver. Below its rated
 * voltage every amplifier is taken to draw its rated input power (constant power: more current
 * as the voltage sags, the conservative figure for cables and fuses). Above it an unregulated
 * amplifier's output, and so its input, grows as (V/V_rated)² (a conductance, I = P·V/V_rated²)
 * until its stated maximum output, where it is constant power again. A regulated one stays at
 * constant power throughout.
 */
export interface AmplifierDraw {
	/** Input power at and below the rated voltage (W), at the demand asked. */
	powerW: number;
	/** Where the (V/V_rated)² part starts (V); +∞ for a regulated amplifier. */
	ratedVoltageV: number;
	/** Input power where the stated maximum output is reached (W); +∞ when none is stated. */
	maxPowerW: number;
}

export function amplifierDraw(
	amp: Pick<
		Amplifier,
		'ratedPowerW' | 'ratedVoltageV' | 'efficiency' | 'quantity' | 'regulated' | 'maxOutputW'
	>,
	demand: number,
): AmplifierDraw {
	const powerW = amplifierInputPowerW(amp, demand);
	if (amp.regulated)
		return { powerW, ratedVoltageV: Number.POSITIVE_INFINITY, maxPowerW: Number.POSITIVE_INFINITY };
	const cap = amp.maxOutputW ?? null;
	return {
		powerW,
		ratedVoltageV: amp.ratedVoltageV,
		maxPowerW:
			cap === null ? Number.POSITIVE_INFINITY : Math.max(powerW, (powerW * cap) / amp.ratedPowerW),
	};
}

/** Current drawn at terminal voltage v (A) and dI/dv, for a draw scaled by λ. */
export function amplifierDrawCurrent(d: AmplifierDraw, v: number, lambda = 1): [number, number] {
	const p = lambda * d.powerW;
	if (p === 0) return [0, 0];
	if (v <= d.ratedVoltageV) return [p / v, -p / (v * v)];
	const g = p / (d.ratedVoltageV * d.ratedVoltageV);
	const pMax = lambda * d.maxPowerW;
	if (g * v * v >= pMax) return [pMax / v, -pMax / (v * v)];
	return [g * v, g];
}

/**
 * Supply current (A) an amplifier draws at terminal voltage V when driven at demand d: the one
 * amplifier law every view reads (the solver, the fixed-voltage table, the sweep, the session).
 * Constant input power P = d·P_rated·n/η up to the rated voltage (I = P/V); above it an
 * unregulated amplifier's draw grows as (V/V_rated)² (I = P·V/V_rated²) until its stated maximum
 * output; a regulated one stays at constant power.
 */
export function amplifierCurrentA(
	amp: Pick<
		Amplifier,
		'ratedPowerW' | 'ratedVoltageV' | 'efficiency' | 'quantity' | 'regulated' | 'maxOutputW'
	>,
	demand: number,
	voltageV: number,
): number {
	return amplifierDrawCurrent(amplifierDraw(amp, demand), voltageV)[0];
}

/** ∫ I dv from 1 V: the amplifier's share of the network's co-content (for the line search). */
export function amplifierDrawCoContent(d: AmplifierDraw, v: number, lambda = 1): number {
	const p = lambda * d.powerW;
	if (p === 0) return 0;
	const vr = d.ratedVoltageV;
	if (v <= vr) return p * Math.log(v);
	const g = p / (vr * vr);
	const pMax = lambda * d.maxPowerW;
	const vCap = Math.sqrt(pMax / g);
	if (v <= vCap) return p * Math.log(vr) + 0.5 * g * (v * v - vr * vr);
	return p * Math.log(vr) + 0.5 * g * (vCap * vCap - vr * vr) + pMax * Math.log(v / vCap);
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
export function outputLossDb(
	amp: Pick<Amplifier, 'ratedPowerW' | 'ratedVoltageV' | 'regulated'>,
	voltageV: number,
): number {
	return powerRatioDb(availableOutputW(amp, voltageV), amp.ratedPowerW);
}
