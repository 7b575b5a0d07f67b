import { EngineInputError } from './errors';
/** One logger sample: time (s), supply voltage (V), current (A). */
export interface Sample {
	tS: number;
	volts: number;
	amps: number;
}

export interface RunAnalysis {
	samples: number;
	durationS: number;
	minVolts: number;
	/** Arithmetic mean over samples (V). */
	meanVolts: number;
	peakAmps: number;
	meanAmps: number;
	/** ∫ V·I dt by the trapezoid rule (Wh). */
	energyWh: number;
	/**
	 * The supply seen as a Thevenin source: least-squares line V = V0 − R·I over the samples.
	 * Null when the current hardly varies (the slope is not defined).
	 */
	effective: { resistanceOhm: number; openCircuitV: number; r2: number } | null;
}

/** Analysis of a logged run (samples in time order). */
export function analyseRun(samples: Sample[]): RunAnalysis {
	if (samples.length === 0)
		throw new EngineInputError([
			{ path: 'samples', message: 'A logger file needs at least one sample' },
		]);
	const n = samples.length;
	let minV = Number.POSITIVE_INFINITY;
	let sumV = 0;
	let peakA = Number.NEGATIVE_INFINITY;
	let sumA = 0;
	let joules = 0;
	for (let i = 0; i < n; i++) {
		const s = samples[i]!;
		minV = Math.min(minV, s.volts);
		peakA = Math.max(peakA, s.amps);
		sumV += s.volts;
		sumA += s.amps;
		if (i > 0) {
			const p = samples[i - 1]!;
			joules += ((p.volts * p.amps + s.volts * s.amps) / 2) * (s.tS - p.tS);
		}
	}
	const meanV = sumV / n;
	const meanA = sumA / n;
	let sxx = 0;
	let sxy = 0;
	let syy = 0;
	for (const s of samples) {
		sxx += (s.amps - meanA) ** 2;
		sxy += (s.amps - meanA) * (s.volts - meanV);
		syy += (s.volts - meanV) ** 2;
	}
	// The slope needs the current to move: at least 0.5 A of spread across the run.
	const slope = sxy / sxx; // dV/dI, negative for a sagging supply
	const effective =
		Math.sqrt(sxx / n) > 0.5
			? {
					resistanceOhm: -slope,
					openCircuitV: meanV - slope * meanA,
					r2: syy > 0 ? (sxy * sxy) / (sxx * syy) : 1,
				}
			: null;
	return {
		samples: n,
		durationS: samples[n - 1]!.tS - samples[0]!.tS,
		minVolts: minV,
		meanVolts: meanV,
		peakAmps: peakA,
		meanAmps: meanA,
		energyWh: joules / 3600,
		effective,
	};
}
