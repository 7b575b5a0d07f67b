import type { Sample } from '@/engine/browser';

/** A burp is a current rise of at least this much over the resting draw (A). */
const MIN_RISE_A = 5;

/**
 * When the burp starts in a logger trace: the first instant the current crosses halfway from the
 * resting draw to the peak, interpolated between the two samples around the crossing (the 50 %
 * reference level of a pulse edge, as IEEE 181 defines it). The resting draw is the lowest current
 * seen before the peak, so a trace that starts mid-burp finds its edge at the first sample. Returns the trace's first time when there is no clear rise (a flat trace), and
 * null for an empty one.
 */
export function burpStartS(samples: readonly Sample[]): number | null {
	if (samples.length === 0) return null;
	let peakI = 0;
	for (let i = 1; i < samples.length; i++) if (samples[i]!.amps > samples[peakI]!.amps) peakI = i;
	let rest = samples[0]!.amps;
	for (let i = 1; i <= peakI; i++) rest = Math.min(rest, samples[i]!.amps);
	const peak = samples[peakI]!.amps;
	if (!(peak - rest >= MIN_RISE_A)) return samples[0]!.tS;
	const half = rest + (peak - rest) / 2;
	for (let i = 0; i <= peakI; i++) {
		const s = samples[i]!;
		if (s.amps < half) continue;
		if (i === 0) return s.tS;
		const p = samples[i - 1]!;
		return p.tS + ((half - p.amps) / (s.amps - p.amps)) * (s.tS - p.tS);
	}
	return samples[peakI]!.tS;
}

/** A trace moved so that time 0 is the given start (thinned to at most `maxPoints`). */
export function alignTrace(samples: readonly Sample[], startS: number, maxPoints = 400): Sample[] {
	const step = Math.max(1, Math.ceil(samples.length / maxPoints));
	const out: Sample[] = [];
	for (let i = 0; i < samples.length; i++)
		if (i % step === 0 || i === samples.length - 1) {
			const s = samples[i]!;
			out.push({ tS: s.tS - startS, volts: s.volts, amps: s.amps });
		}
	return out;
}
