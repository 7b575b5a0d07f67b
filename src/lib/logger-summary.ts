/** A logger sample: time (s), volts, amps. */
export interface LoggerPoint {
	tS: number;
	volts: number;
	amps: number;
}

/**
 * The logger's resting and minimum voltage of a run, from its samples: the burp starts at the
 * first sample whose current passes halfway from the file's lowest to its highest current; resting
 * is the mean voltage of the samples before it (none when the file starts mid-burp). Worked out
 * from the samples in hand when they are written, so no statement reads `run_sample` back.
 */
export function loggerSummary(
	samples: readonly LoggerPoint[],
): { minV: number; restingV: number | null } | null {
	if (samples.length === 0) return null;
	let lo = Infinity;
	let hi = -Infinity;
	let minV = Infinity;
	for (const s of samples) {
		if (s.amps < lo) lo = s.amps;
		if (s.amps > hi) hi = s.amps;
		if (s.volts < minV) minV = s.volts;
	}
	const half = lo + 0.5 * (hi - lo);
	let t0 = Infinity;
	for (const s of samples) if (s.amps >= half && s.tS < t0) t0 = s.tS;
	let sum = 0;
	let n = 0;
	for (const s of samples)
		if (s.tS < t0) {
			sum += s.volts;
			n++;
		}
	return { minV, restingV: n ? sum / n : null };
}
