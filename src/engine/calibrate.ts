import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { alternatorLimitA } from './alternator';
import { bankThevenin } from './battery';
import { solveDense } from './linear';
import { compileNetwork, solveCompiled } from './network';
import type { Sample } from './run-analysis';
import { solveNetwork } from './solve';
import type { BuildDocument } from './types';

/**
 * What a run's log can correct in the model: every bank's internal resistance (one factor for all),
 * every alternator's output at the run's engine speed (one factor), and a resistance in one cable's
 * terminations (a tired crimp).
 */
export type CalibrationParameter = 'bankResistance' | 'alternatorOutput' | 'connection';

export interface CalibrationOptions {
	/** Engine speed during the run (rpm). */
	engineRpm: number;
	conductorTempC: number;
	fit: CalibrationParameter[];
	/** The cable whose terminations may hold extra resistance (with `connection`). */
	cableId?: string;
	/** Samples the fit uses at most, evenly spread over the run. */
	maxPoints?: number;
}

export interface FittedParameter {
	key: CalibrationParameter;
	label: string;
	unit: string;
	/** The model's value before the fit and the fitted one, in `unit`. */
	before: number;
	fitted: number;
	/** Half-width of the ~95 % interval (two standard errors), in `unit`; null when not determined. */
	uncertainty: number | null;
	/** False when the samples cannot tell this value (it moves nothing, or only with another). */
	determined: boolean;
}

export interface CalibrationPoint {
	amps: number;
	measuredV: number;
	beforeV: number;
	afterV: number;
}

export type CalibrationResult =
	| {
			ok: true;
			points: number;
			parameters: FittedParameter[];
			/** Root-mean-square difference between the samples and the model (V). */
			rmsBeforeV: number;
			rmsAfterV: number;
			iterations: number;
			/** The samples beside the model before and after, by current (for a chart). */
			trace: CalibrationPoint[];
			/** The revision's document with the fitted values in place: a plan to start from. */
			document: BuildDocument;
	  }
	| { ok: false; reason: string };

/** Parameters are fitted as factors near 1 and the connection in mΩ: all of order one. */
interface Factors {
	bankResistance: number;
	alternatorOutput: number;
	connectionMilliohm: number;
}

const NEUTRAL: Factors = { bankResistance: 1, alternatorOutput: 1, connectionMilliohm: 0 };

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
function runModel(
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
function thin(samples: Sample[], max: number): Sample[] {
	if (samples.length <= max) return samples;
	return Array.from(
		{ length: max },
		(_, i) => samples[Math.round((i * (samples.length - 1)) / (max - 1))]!,
	);
}

const rms = (xs: number[]) => Math.sqrt(xs.reduce((s, x) => s + x * x, 0) / Math.max(1, xs.length));

/**
 * Fits the chosen model parameters to a run's logger samples by least squares
 * (Levenberg–Marquardt, `ml-levenberg-marquardt`), and states each one's uncertainty from the
 * Jacobian at the fit: cov = s²·(JᵀJ)⁻¹ with s² = Σr²/(n − p) (NIST/SEMATECH e-Handbook of
 * Statistical Methods, §4.4.5.2, the standard large-sample approximation for nonlinear least
 * squares). A parameter the samples cannot move, or only together with another, is reported as
 * not determined instead of being given a number.
 */
export function calibrateFromRun(
	doc: BuildDocument,
	samples: Sample[],
	options: CalibrationOptions,
): CalibrationResult {
	const fit = [...new Set(options.fit)];
	if (fit.length === 0) return { ok: false, reason: 'Choose at least one value to fit.' };
	if (doc.amplifiers.length === 0)
		return { ok: false, reason: 'The revision has no amplifier for the logger to read.' };
	if (fit.includes('connection') && !doc.cables.some((c) => c.id === options.cableId))
		return { ok: false, reason: 'Choose the cable whose joints may be tired.' };
	if (fit.includes('bankResistance') && doc.banks.length === 0)
		return { ok: false, reason: 'The revision has no bank to fit.' };
	if (fit.includes('alternatorOutput') && doc.alternators.length === 0)
		return { ok: false, reason: 'The revision has no alternator to fit.' };
	const usable = samples.filter(
		(s) => Number.isFinite(s.volts) && Number.isFinite(s.amps) && s.amps >= 0 && s.volts > 0,
	);
	const points = thin(usable, options.maxPoints ?? 60);
	if (points.length < fit.length + 2)
		return {
			ok: false,
			reason: `The log needs at least ${fit.length + 2} samples with current for this fit.`,
		};

	// Each amplifier's share of the amplifiers' current at full demand.
	const full = solveNetwork(doc, {
		engineRpm: options.engineRpm,
		demand: 1,
		conductorTempC: options.conductorTempC,
	});
	const total = full.amplifiers.reduce((s, a) => s + Math.max(0, a.currentA), 0);
	const shares = full.amplifiers.map((a) =>
		total > 0 ? Math.max(0, a.currentA) / total : 1 / doc.amplifiers.length,
	);

	const factorsOf = (p: number[]): Factors => {
		const f = { ...NEUTRAL };
		fit.forEach((key, i) => {
			if (key === 'bankResistance') f.bankResistance = p[i]!;
			else if (key === 'alternatorOutput') f.alternatorOutput = p[i]!;
			else f.connectionMilliohm = p[i]!;
		});
		return f;
	};
	const model = (p: number[]) =>
		runModel(applyCalibration(doc, factorsOf(p), options.cableId), options, shares);
	// A collapsed operating point has no voltage: far below any sample, so the fit moves away from it.
	const safe = (m: (a: number) => number) => (a: number) => {
		const v = m(a);
		return Number.isFinite(v) ? v : -100;
	};
	const x = points.map((s) => s.amps);
	const y = points.map((s) => s.volts);
	const start = fit.map((k) => (k === 'connection' ? 0.5 : 1));
	const lm = levenbergMarquardt({ x, y }, (p) => safe(model(p)), {
		initialValues: start,
		minValues: fit.map((k) => (k === 'connection' ? 0 : 0.05)),
		maxValues: fit.map((k) => (k === 'connection' ? 1000 : 20)),
		gradientDifference: fit.map(() => 1e-4),
		centralDifference: true,
		damping: 1e-2,
		maxIterations: 25,
		errorTolerance: 1e-12,
	});
	const p = lm.parameterValues;
	const before = model(fit.map((k) => (k === 'connection' ? 0 : 1)));
	const beforeV = x.map((a) => before(a));
	const after = model(p);
	const afterV = x.map((a) => after(a));
	if (afterV.some((v) => !Number.isFinite(v)))
		return {
			ok: false,
			reason:
				'The fitted model collapses at the logged currents; the log and the revision disagree too far to fit.',
		};
	const residuals = afterV.map((v, i) => y[i]! - v);

	// Jacobian at the fit by central differences, then the covariance of the estimates.
	const n = x.length;
	const k = fit.length;
	const jac: number[][] = fit.map((_, j) => {
		const h = Math.max(1e-4, Math.abs(p[j]!) * 1e-3);
		const up = model(p.map((v, i) => (i === j ? v + h : v)));
		const down = model(p.map((v, i) => (i === j ? Math.max(0, v - h) : v)));
		const width = p[j]! + h - Math.max(0, p[j]! - h);
		return x.map((a) => (up(a) - down(a)) / width);
	});
	const jtj = new Float64Array(k * k);
	for (let a = 0; a < k; a++)
		for (let b = 0; b < k; b++) {
			let s = 0;
			for (let i = 0; i < n; i++) s += jac[a]![i]! * jac[b]![i]!;
			jtj[a * k + b] = s;
		}
	const s2 = residuals.reduce((s, r) => s + r * r, 0) / Math.max(1, n - k);
	// Floor the noise at a logger's resolution (1 mV) so a perfect fit still states a width.
	const noise2 = Math.max(s2, 1e-6);
	const variance: (number | null)[] = fit.map((_, j) => {
		const a = Float64Array.from(jtj);
		const e = new Float64Array(k);
		e[j] = 1;
		if (!solveDense(a, e, k)) return null;
		const v = e[j]! * noise2;
		return Number.isFinite(v) && v > 0 ? v : null;
	});
	const f = factorsOf(p);
	const bankR = doc.banks.reduce((s, b) => s + 1 / bankThevenin(b).resistanceOhm, 0);
	const altA = doc.alternators.reduce((s, a) => s + alternatorLimitA(a, options.engineRpm), 0);
	const parameters: FittedParameter[] = fit.map((key, j) => {
		const sd = variance[j] === null ? null : Math.sqrt(variance[j]!);
		const relative = sd === null ? Number.POSITIVE_INFINITY : sd / Math.max(Math.abs(p[j]!), 1e-9);
		// Undetermined: the samples hardly move the model with it (a zero column, or one another's).
		const determined = sd !== null && (key === 'connection' ? sd < 1000 : relative < 1);
		const two = (scale: number) => (determined && sd !== null ? 2 * sd * scale : null);
		if (key === 'bankResistance') {
			const parallel = 1000 / bankR; // all banks in parallel, mΩ
			return {
				key,
				label: 'Bank internal resistance (all banks in parallel)',
				unit: 'mΩ',
				before: parallel,
				fitted: parallel * f.bankResistance,
				uncertainty: two(parallel),
				determined,
			};
		}
		if (key === 'alternatorOutput')
			return {
				key,
				label: `Alternator output at ${Math.round(options.engineRpm)} rpm`,
				unit: 'A',
				before: altA,
				fitted: altA * f.alternatorOutput,
				uncertainty: two(altA),
				determined,
			};
		const cable = doc.cables.find((c) => c.id === options.cableId)!;
		const existing = (cable.connectionResistanceOhm ?? 0) * 1000;
		return {
			key,
			label: `Extra resistance in "${cable.label}"`,
			unit: 'mΩ',
			before: existing,
			fitted: existing + f.connectionMilliohm,
			uncertainty: two(1),
			determined,
		};
	});
	const order = x.map((_, i) => i).sort((a, b) => x[a]! - x[b]!);
	return {
		ok: true,
		points: n,
		parameters,
		rmsBeforeV: rms(beforeV.map((v, i) => (Number.isFinite(v) ? y[i]! - v : y[i]!))),
		rmsAfterV: rms(residuals),
		iterations: lm.iterations,
		trace: order.map((i) => ({
			amps: x[i]!,
			measuredV: y[i]!,
			beforeV: beforeV[i]!,
			afterV: afterV[i]!,
		})),
		document: applyCalibration(doc, f, options.cableId),
	};
}
