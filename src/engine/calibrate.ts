import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { alternatorLimitA } from './alternator';
import { bankThevenin } from './battery';
import { solveDense } from './linear';
import {
	amplifierShares,
	applyCalibration,
	correlation,
	type Factors,
	NEUTRAL,
	rms,
	runModel,
	silentReason,
	thin,
} from './calibration-model';
import type { Sample } from './run-analysis';
import type { BuildDocument } from './types';

/**
 * What a run's log can correct in the model: every bank's internal resistance (one factor for all),
 * the banks' state of charge (their resting voltage: real logs start at any charge), every
 * alternator's output at the run's engine speed (one factor), and a resistance in one cable's
 * terminations (a tired crimp).
 */
export type CalibrationParameter =
	'bankResistance' | 'bankCharge' | 'alternatorOutput' | 'connection';

/** The values a member can ask the fit for, in the order they are offered and fitted. */
export const CALIBRATION_PARAMETERS: readonly CalibrationParameter[] = [
	'bankResistance',
	'bankCharge',
	'alternatorOutput',
	'connection',
];

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
	/** Why it was not determined, in words (null when it was). */
	reason: string | null;
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

const LABELS: Record<CalibrationParameter, string> = {
	bankResistance: 'bank internal resistance',
	bankCharge: "banks' state of charge",
	alternatorOutput: 'alternator output',
	connection: 'extra joint resistance',
};

/** A plausible change of each parameter (in its fitted units): what "moves the model" is judged by. */
const PLAUSIBLE: Record<CalibrationParameter, number> = {
	bankResistance: 0.5,
	bankCharge: 0.2,
	alternatorOutput: 0.5,
	connection: 1,
};

/** A change a logger cannot see (V): a tenth of a millivolt. */
const UNSEEN_V = 1e-4;

/**
 * Fits the chosen model parameters to a run's logger samples by least squares
 * (Levenberg–Marquardt, `ml-levenberg-marquardt`), and states each one's uncertainty from the
 * Jacobian at the fit: cov = s²·(JᵀJ)⁻¹ with s² = Σr²/(n − p) (NIST/SEMATECH e-Handbook of
 * Statistical Methods, §4.4.5.2, the standard large-sample approximation for nonlinear least
 * squares). Before fitting, each value is tested for what the log can say about it: one that moves
 * no sample by more than a logger resolves (the alternator with the engine off, or never at its
 * limit) is left out with the reason; of two the log cannot tell apart (two resistances in series
 * on the only path) the later one is left out, saying which. The rest are fitted and each given
 * with its bounds.
 */
export function calibrateFromRun(
	doc: BuildDocument,
	samples: Sample[],
	options: CalibrationOptions,
): CalibrationResult {
	const asked = CALIBRATION_PARAMETERS.filter((k) => options.fit.includes(k));
	if (asked.length === 0) return { ok: false, reason: 'Choose at least one value to fit.' };
	if (doc.amplifiers.length === 0)
		return { ok: false, reason: 'The revision has no amplifier for the logger to read.' };
	if (asked.includes('connection') && !doc.cables.some((c) => c.id === options.cableId))
		return { ok: false, reason: 'Choose the cable whose joints may be tired.' };
	if ((asked.includes('bankResistance') || asked.includes('bankCharge')) && doc.banks.length === 0)
		return { ok: false, reason: 'The revision has no bank to fit.' };
	if (asked.includes('alternatorOutput') && doc.alternators.length === 0)
		return { ok: false, reason: 'The revision has no alternator to fit.' };
	const usable = samples.filter(
		(s) => Number.isFinite(s.volts) && Number.isFinite(s.amps) && s.amps >= 0 && s.volts > 0,
	);
	const points = thin(usable, options.maxPoints ?? 60);
	if (points.length < asked.length + 2)
		return {
			ok: false,
			reason: `The log needs at least ${asked.length + 2} samples with current for this fit.`,
		};

	const shares = amplifierShares(doc, options);
	// The banks' own charge where they agree, else the mean: the starting point of a charge fit.
	const startCharge = doc.banks.length
		? doc.banks.reduce((t, b) => t + b.stateOfCharge, 0) / doc.banks.length
		: 1;
	const neutralOf = (k: CalibrationParameter) =>
		k === 'connection' ? 0 : k === 'bankCharge' ? startCharge : 1;
	const factorsOf = (fit: readonly CalibrationParameter[], p: readonly number[]): Factors => {
		const f = { ...NEUTRAL };
		fit.forEach((key, i) => {
			if (key === 'bankResistance') f.bankResistance = p[i]!;
			else if (key === 'alternatorOutput') f.alternatorOutput = p[i]!;
			else if (key === 'bankCharge') f.stateOfCharge = p[i]!;
			else f.connectionMilliohm = p[i]!;
		});
		return f;
	};
	const x = points.map((s) => s.amps);
	const y = points.map((s) => s.volts);
	const predict = (fit: readonly CalibrationParameter[], p: readonly number[]) => {
		const m = runModel(applyCalibration(doc, factorsOf(fit, p), options.cableId), options, shares);
		return x.map((a) => m(a));
	};
	const bounds = (k: CalibrationParameter): [number, number] =>
		k === 'connection' ? [0, 1000] : k === 'bankCharge' ? [0.02, 1] : [0.05, 20];

	/** ∂V/∂p at every sample by central differences (one column per parameter). */
	const jacobian = (fit: readonly CalibrationParameter[], p: readonly number[]) =>
		fit.map((key, j) => {
			const [lo, hi] = bounds(key);
			const h = Math.max(1e-4, Math.abs(p[j]!) * 1e-3);
			const up = Math.min(hi, p[j]! + h);
			const down = Math.max(lo, p[j]! - h);
			const vUp = predict(
				fit,
				p.map((v, i) => (i === j ? up : v)),
			);
			const vDown = predict(
				fit,
				p.map((v, i) => (i === j ? down : v)),
			);
			return vUp.map((v, i) => (v - vDown[i]!) / (up - down));
		});

	// What the log can say about each value asked, at the model as drawn.
	const undetermined = new Map<CalibrationParameter, string>();
	const start = asked.map(neutralOf);
	const startCols = jacobian(asked, start);
	asked.forEach((key, j) => {
		const col = startCols[j]!;
		const moves = Math.max(...col.map((d) => (Number.isFinite(d) ? Math.abs(d) : 0)));
		if (moves * PLAUSIBLE[key] >= UNSEEN_V) return;
		undetermined.set(key, silentReason(key, doc, options));
	});
	let fit = asked.filter((k) => !undetermined.has(k));
	// Two values the log cannot tell apart: their columns are (nearly) parallel.
	const cols = new Map(asked.map((k, j) => [k, startCols[j]!]));
	for (let a = 0; a < fit.length; a++)
		for (let b = a + 1; b < fit.length; b++) {
			const ca = cols.get(fit[a]!)!;
			const cb = cols.get(fit[b]!)!;
			if (Math.abs(correlation(ca, cb)) > 0.9995) {
				undetermined.set(
					fit[b]!,
					`This log cannot tell it apart from the ${LABELS[fit[a]!]}: both move the voltage the same way at every current. Fit one of them.`,
				);
				fit = fit.filter((_, i) => i !== b);
				b--;
			}
		}

	const safe = (v: number) => (Number.isFinite(v) ? v : -100);
	let p: number[] = [];
	let iterations = 0;
	if (fit.length > 0) {
		// One model per parameter set, answering every sample (the fitting library asks per sample).
		let cacheKey = '';
		let cacheModel: (a: number) => number = () => Number.NaN;
		const lm = levenbergMarquardt(
			{ x, y },
			(q) => {
				const key = q.join(',');
				if (key !== cacheKey) {
					cacheKey = key;
					cacheModel = runModel(
						applyCalibration(doc, factorsOf(fit, q), options.cableId),
						options,
						shares,
					);
				}
				const m = cacheModel;
				return (a: number) => safe(m(a));
			},
			{
				initialValues: fit.map(neutralOf),
				minValues: fit.map((k) => bounds(k)[0]),
				maxValues: fit.map((k) => bounds(k)[1]),
				gradientDifference: fit.map(() => 1e-4),
				centralDifference: true,
				damping: 10,
				maxIterations: 60,
				errorTolerance: 1e-12,
			},
		);
		p = lm.parameterValues;
		iterations = lm.iterations;
	}
	const beforeV = predict([], []);
	const afterV = fit.length ? predict(fit, p) : beforeV;
	if (afterV.some((v) => !Number.isFinite(v)))
		return {
			ok: false,
			reason:
				'The fitted model collapses at the logged currents; the log and the revision disagree too far to fit.',
		};
	const residuals = afterV.map((v, i) => y[i]! - v);

	// The covariance of the estimates from the Jacobian at the fit.
	const n = x.length;
	const k = fit.length;
	const jac = k ? jacobian(fit, p) : [];
	const jtj = new Float64Array(k * k);
	for (let a = 0; a < k; a++)
		for (let b = 0; b < k; b++) {
			let sum = 0;
			for (let i = 0; i < n; i++) sum += jac[a]![i]! * jac[b]![i]!;
			jtj[a * k + b] = sum;
		}
	const s2 = residuals.reduce((sum, r) => sum + r * r, 0) / Math.max(1, n - k);
	// Floor the noise at a logger's resolution (1 mV) so a perfect fit still states a width.
	const noise2 = Math.max(s2, 1e-6);
	const sdOf = new Map<CalibrationParameter, number | null>();
	fit.forEach((key, j) => {
		const a = Float64Array.from(jtj);
		const e = new Float64Array(k);
		e[j] = 1;
		const v = solveDense(a, e, k) ? e[j]! * noise2 : Number.NaN;
		sdOf.set(key, Number.isFinite(v) && v > 0 ? Math.sqrt(v) : null);
	});
	// Correlations of the estimates (from the same inverse): a value poorly fixed because it trades
	// off against another is named with that other.
	const inverse: number[][] = fit.map((_, j) => {
		const a = Float64Array.from(jtj);
		const e = new Float64Array(k);
		e[j] = 1;
		return solveDense(a, e, k) ? Array.from(e) : fit.map(() => Number.NaN);
	});
	const partner = (j: number): CalibrationParameter | null => {
		let best: CalibrationParameter | null = null;
		let bestRho = 0.95;
		fit.forEach((other, m) => {
			if (m === j) return;
			const rho = inverse[j]![m]! / Math.sqrt(inverse[j]![j]! * inverse[m]![m]!);
			if (Math.abs(rho) > bestRho) {
				bestRho = Math.abs(rho);
				best = other;
			}
		});
		return best;
	};
	const fitted = factorsOf(fit, p);
	const bankG = doc.banks.reduce((t, b) => t + 1 / bankThevenin(b).resistanceOhm, 0);
	const altA = doc.alternators.reduce((t, a) => t + alternatorLimitA(a, options.engineRpm), 0);
	const parameters: FittedParameter[] = asked.map((key) => {
		const j = fit.indexOf(key);
		const sd = j < 0 ? null : (sdOf.get(key) ?? null);
		const value = j < 0 ? neutralOf(key) : p[j]!;
		let reason = undetermined.get(key) ?? null;
		if (reason === null && sd === null)
			reason = 'The fit could not put bounds on it: the log barely moves with it.';
		if (reason === null && sd !== null && key !== 'connection' && 2 * sd > Math.abs(value)) {
			const other = partner(j);
			reason = other
				? `This log cannot tell it apart from the ${LABELS[other]}: more of one and less of the other fit it as well (±${Math.round((200 * sd) / Math.abs(value))} %). Fit one of them.`
				: `The log fits about as well anywhere within ±${Math.round((200 * sd) / Math.abs(value))} % of it.`;
		}
		const determined = reason === null;
		const two = (scale: number) => (determined && sd !== null ? 2 * sd * scale : null);
		if (key === 'bankResistance') {
			const parallel = 1000 / bankG; // all banks in parallel, mΩ
			return {
				key,
				label: 'Bank internal resistance (all banks in parallel)',
				unit: 'mΩ',
				before: parallel,
				fitted: parallel * (determined ? fitted.bankResistance : 1),
				uncertainty: two(parallel),
				determined,
				reason,
			};
		}
		if (key === 'bankCharge')
			return {
				key,
				label: 'Banks’ state of charge (their resting voltage)',
				unit: '%',
				before: startCharge * 100,
				fitted: (determined ? (fitted.stateOfCharge ?? startCharge) : startCharge) * 100,
				uncertainty: two(100),
				determined,
				reason,
			};
		if (key === 'alternatorOutput')
			return {
				key,
				label: `Alternator output at ${Math.round(options.engineRpm)} rpm`,
				unit: 'A',
				before: altA,
				fitted: altA * (determined ? fitted.alternatorOutput : 1),
				uncertainty: two(altA),
				determined,
				reason,
			};
		const cable = doc.cables.find((c) => c.id === options.cableId)!;
		const existing = (cable.connectionResistanceOhm ?? 0) * 1000;
		return {
			key,
			label: `Extra resistance in "${cable.label}"`,
			unit: 'mΩ',
			before: existing,
			fitted: existing + (determined ? fitted.connectionMilliohm : 0),
			uncertainty: two(1),
			determined,
			reason,
		};
	});
	// The plan holds only what was determined.
	const kept = fit.filter((key) => parameters.find((q) => q.key === key)!.determined);
	const order = x.map((_, i) => i).sort((a, b) => x[a]! - x[b]!);
	return {
		ok: true,
		points: n,
		parameters,
		rmsBeforeV: rms(beforeV.map((v, i) => (Number.isFinite(v) ? y[i]! - v : y[i]!))),
		rmsAfterV: rms(residuals),
		iterations,
		trace: order.map((i) => ({
			amps: x[i]!,
			measuredV: y[i]!,
			beforeV: beforeV[i]!,
			afterV: afterV[i]!,
		})),
		document: applyCalibration(
			doc,
			factorsOf(
				kept,
				kept.map((key) => p[fit.indexOf(key)]!),
			),
			options.cableId,
		),
	};
}

export { applyCalibration, loggedVoltageModel } from './calibration-model';
