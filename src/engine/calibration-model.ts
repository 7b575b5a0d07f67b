// The model a calibration fits: a document with its factors applied, run over a log's samples.
import { compileNetwork } from './network';
import type { Sample } from './run-analysis';
import { solveNetwork } from './solve';
import { solveCompiled } from './solver';
import type { BuildDocument } from './types';
import type { CalibrationOptions, CalibrationParameter } from './calibrate';

/**
 * Parameters are fitted as factors near 1, the connection in mΩ and the charge as a fraction: all
 * of order one. `stateOfCharge` null leaves each bank's own.
 */
export interface Factors {
	bankResistance: number;
	alternatorOutput: number;
	connectionMilliohm: number;
	stateOfCharge?: number | null;
}

export const NEUTRAL: Factors = {
	bankResistance: 1,
	alternatorOutput: 1,
	connectionMilliohm: 0,
	stateOfCharge: null,
};

/** The document with the factors applied (a new object; the input is not touched). */
export function applyCalibration(
	doc: BuildDocument,
	f: Factors,
	cableId: string | undefined,
): BuildDocument {
	return {
		...doc,
		banks: doc.banks.map((b) => ({
			...b,
			unitResistanceOhm: b.unitResistanceOhm * f.bankResistance,
			stateOfCharge:
				f.stateOfCharge === null || f.stateOfCharge === undefined
					? b.stateOfCharge
					: f.stateOfCharge,
		})),
		alternators: doc.alternators.map((a) => ({
			...a,
			ratedHotA: a.ratedHotA * f.alternatorOutput,
			curve: a.curve.map((p) => ({ ...p, currentA: p.currentA * f.alternatorOutput })),
		})),
		cables: doc.cables.map((c) =>
			c.id === cableId && f.connectionMilliohm !== 0
				? {
						...c,
						connectionResistanceOhm: (c.connectionResistanceOhm ?? 0) + f.connectionMilliohm / 1000,
					}
				: c,
		),
	};
}

/**
 * The model of a logged run: the logger reads the lowest amplifier's terminal voltage and the
 * current into the amplifiers. Each amplifier becomes a current sink carrying its share of the
 * logged current (its share at full demand), so one network per parameter set answers every sample
 * with a warm-started solve.
 */
export function runModel(
	doc: BuildDocument,
	options: CalibrationOptions,
	shares: number[],
): (amps: number) => number {
	const asLoads: BuildDocument = {
		...doc,
		amplifiers: [],
		loads: [
			...doc.loads,
			...doc.amplifiers.map((a, i) => ({
				id: `${a.id}\u0000logged`,
				label: a.label,
				positive: a.positive,
				negative: a.negative,
				currentA: shares[i]!,
			})),
		],
	};
	const net = compileNetwork(asLoads, {
		engineRpm: options.engineRpm,
		demand: 1,
		conductorTempC: options.conductorTempC,
	});
	const first = doc.loads.length;
	const ampLoads = net.loads.slice(first);
	let warm: Float64Array | undefined;
	return (amps: number) => {
		ampLoads.forEach((l, i) => {
			l.currentA = shares[i]! * amps;
		});
		const raw = solveCompiled(net, warm);
		if (raw.collapsed) return Number.NaN;
		warm = raw.v;
		let lowest = Number.POSITIVE_INFINITY;
		for (const l of ampLoads) {
			const vp = l.p < 0 ? 0 : raw.v[l.p]!;
			const vn = l.n < 0 ? 0 : raw.v[l.n]!;
			lowest = Math.min(lowest, vp - vn);
		}
		return lowest;
	};
}

/** Evenly spread samples, at most `max`, keeping the first and the last. */
export function thin(samples: Sample[], max: number): Sample[] {
	if (samples.length <= max) return samples;
	return Array.from(
		{ length: max },
		(_, i) => samples[Math.round((i * (samples.length - 1)) / (max - 1))]!,
	);
}

export const rms = (xs: number[]) =>
	Math.sqrt(xs.reduce((s, x) => s + x * x, 0) / Math.max(1, xs.length));

/** Each amplifier's share of the amplifiers' current at full demand (the logger reads their sum). */
export function amplifierShares(
	doc: BuildDocument,
	options: Pick<CalibrationOptions, 'engineRpm' | 'conductorTempC'>,
) {
	const full = solveNetwork(doc, {
		engineRpm: options.engineRpm,
		demand: 1,
		conductorTempC: options.conductorTempC,
	});
	const total = full.amplifiers.reduce((s, a) => s + Math.max(0, a.currentA), 0);
	return full.amplifiers.map((a) =>
		total > 0 ? Math.max(0, a.currentA) / total : 1 / doc.amplifiers.length,
	);
}

/**
 * What a logger on this build would read: the lowest amplifier terminal voltage (V) at a given
 * current into the amplifiers (A), each amplifier carrying its share. The calibration's own model,
 * also what the demo season's logs are made from. NaN where the system collapses.
 */
export function loggedVoltageModel(
	doc: BuildDocument,
	options: Pick<CalibrationOptions, 'engineRpm' | 'conductorTempC'>,
): (amps: number) => number {
	return runModel(doc, { ...options, fit: [] }, amplifierShares(doc, options));
}

/** Pearson correlation of two columns (0 when either is flat). */
export function correlation(a: readonly number[], b: readonly number[]): number {
	const n = a.length;
	const ma = a.reduce((t, v) => t + v, 0) / n;
	const mb = b.reduce((t, v) => t + v, 0) / n;
	let sab = 0;
	let saa = 0;
	let sbb = 0;
	for (let i = 0; i < n; i++) {
		sab += (a[i]! - ma) * (b[i]! - mb);
		saa += (a[i]! - ma) ** 2;
		sbb += (b[i]! - mb) ** 2;
	}
	// Uncentred when a column is constant (an offset): parallel offsets are as indistinguishable.
	if (saa === 0 || sbb === 0) {
		const dot = a.reduce((t, v, i) => t + v * b[i]!, 0);
		const na = Math.sqrt(a.reduce((t, v) => t + v * v, 0));
		const nb = Math.sqrt(b.reduce((t, v) => t + v * v, 0));
		return na && nb ? dot / (na * nb) : 0;
	}
	return sab / Math.sqrt(saa * sbb);
}

/** Why the log says nothing about a value, in the member's terms. */
export function silentReason(
	key: CalibrationParameter,
	doc: BuildDocument,
	options: Pick<CalibrationOptions, 'engineRpm' | 'cableId'>,
): string {
	if (key === 'alternatorOutput')
		return options.engineRpm === 0
			? 'The engine was off: the alternators give nothing at 0 rpm, so this log says nothing about their output.'
			: 'The alternators never reached their output limit in this log, so it does not show what they can give.';
	if (key === 'bankResistance' || key === 'bankCharge')
		return 'The banks carried no current the logger could see: the alternators held the voltage throughout.';
	const cable = doc.cables.find((c) => c.id === options.cableId);
	return `No logged current flows through "${cable?.label ?? 'that cable'}".`;
}
