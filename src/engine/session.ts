import {
	bankPeukertK,
	bankThevenin,
	CHEMISTRY_PROPS,
	cellsInSeries,
	chargeAcceptanceA,
	peukertEffectiveCurrentA,
} from './battery';
import { beginCapacitorStep, endCapacitorStep } from './capacitor';
import { cableAreaMm2 } from './conductors';
import { ADIABATIC_CONSTANTS } from './heating';
import { type CompiledNetwork, compileNetwork } from './network';
import { alternatorCurrent, bankCurrent } from './newton';
import { solveCompiled } from './solver';
import type { BatteryBank, BuildDocument } from './types';

/** A competition session: `burps` burps of `burpS` seconds with `restS` seconds between. */
export interface SessionSchedule {
	burps: number;
	burpS: number;
	restS: number;
	/** Fraction of rated power during a burp and during a rest (0: amplifiers idle). */
	burpDemand: number;
	restDemand: number;
	/** Engine speed throughout (rpm); 0 = engine off, nothing recharges in the rests. */
	engineRpm: number;
	conductorTempC: number;
	/** Time steps (s) inside a burp and inside a rest. */
	stepS: number;
	restStepS: number;
}

/** A session a team would run between rounds: five 10 s burps a minute apart at a fast idle. */
export const DEFAULT_SESSION: SessionSchedule = {
	burps: 5,
	burpS: 10,
	restS: 60,
	burpDemand: 1,
	restDemand: 0,
	engineRpm: 1500,
	conductorTempC: 25,
	stepS: 0.05,
	restStepS: 0.5,
};

/**
 * The bus is "back" once the strongest source's terminals are within this of the resting voltage
 * the session started from (our tolerance: about what a dash voltmeter resolves).
 */
export const RECOVERY_TOLERANCE_V = 0.05;

export interface SessionBurp {
	/** Start of the burp from the session's start (s). */
	startS: number;
	/** Lowest amplifier terminal voltage during the burp (V); null with no amplifier. */
	lowestAmplifierV: number | null;
	/** Each bank's state of charge at the end of the burp, by bank id. */
	socAfter: Record<string, number>;
	/**
	 * Seconds after the burp until the bus is back within RECOVERY_TOLERANCE_V of the resting
	 * voltage; null when it is not back before the next burp (or the session's end).
	 */
	recoveryS: number | null;
	/** The bus voltage at the end of the rest after this burp (V); null when there is no rest. */
	busAfterRestV: number | null;
}

export interface SessionRun {
	schedule: SessionSchedule;
	/** The strongest source's terminal voltage at rest before the first burp (V). */
	restingV: number;
	burps: SessionBurp[];
	/** Time (s) at which the system had no operating point any more (the session stops), or null. */
	collapsedAtS: number | null;
	endSoc: Record<string, number>;
	/**
	 * The run for a chart, at most ~600 points: the bus voltage, the lowest amplifier voltage in
	 * each interval (so a burp's dip shows however coarse the interval) and each bank's state of charge.
	 */
	trace: {
		timeS: number[];
		busV: number[];
		lowestAmplifierV: Array<number | null>;
		soc: Record<string, number[]>;
	};
	/**
	 * Each cable's temperature at the end of the session by the adiabatic relation over the whole
	 * session's ∫I²dt (IEC 60949; no cooling in the rests, so an upper bound), against its insulation.
	 */
	cables: Array<{ id: string; finalC: number; limitC: number }>;
}

/**
 * Moves a bank's state of charge by its current over dt: discharge counted with the
 * Peukert-effective current I·(I/I_H)^(k−1), charge at face value (coulomb counting).
 */
export function advanceSoc(bank: BatteryBank, soc: number, currentA: number, dtS: number): number {
	return Math.min(1, Math.max(0, soc - advanceSocRate(bank, currentA) * dtS));
}

/** Fraction of the bank's capacity a current takes per second (negative while charging). */
function advanceSocRate(bank: BatteryBank, currentA: number): number {
	const { capacityAh } = bankThevenin(bank);
	if (!(capacityAh > 0)) return 0;
	const eff = peukertEffectiveCurrentA(capacityAh, bank.ratedHours, currentA, bankPeukertK(bank));
	return eff / 3600 / capacityAh;
}

/** Refreshes a compiled network's banks for their states of charge (OCV and charge acceptance). */
export function setBankStates(
	net: CompiledNetwork,
	banks: readonly BatteryBank[],
	soc: Readonly<Record<string, number>>,
) {
	banks.forEach((bank, i) => {
		const compiled = net.banks[i]!;
		const th = bankThevenin(bank, soc[bank.id]!);
		compiled.ocvV = th.ocvV;
		compiled.chargeAcceptanceA = chargeAcceptanceA(bank, soc[bank.id]!);
		compiled.chargeResistanceOhm = th.resistanceOhm;
	});
}

const at = (v: Float64Array, i: number) => (i < 0 ? 0 : v[i]!);

/**
 * Each capacitor bank's voltage before a burp: charged to its terminals' voltage at the operating
 * point with the amplifiers idle (a capacitor carries no current there but its leakage).
 */
export function capacitorRestVoltages(
	doc: BuildDocument,
	conditions: { engineRpm: number; conductorTempC: number },
): number[] {
	const net = compileNetwork(doc, { ...conditions, demand: 0 });
	const { v } = solveCompiled(net);
	return net.capacitors.map((c) => at(v, c.p) - at(v, c.n));
}

/** The strongest source's terminal voltage: what the system settles at. */
function busVoltage(net: CompiledNetwork, v: Float64Array): number {
	let bus = 0;
	for (const b of net.banks) bus = Math.max(bus, at(v, b.p) - at(v, b.n));
	for (const a of net.alternators) {
		const x = at(v, a.p) - at(v, a.n);
		if (alternatorCurrent(a, x)[0] > 0) bus = Math.max(bus, x);
	}
	return bus;
}

function lowestAmp(net: CompiledNetwork, v: Float64Array): number {
	let m = Number.POSITIVE_INFINITY;
	for (const a of net.amplifiers) m = Math.min(m, at(v, a.p) - at(v, a.n));
	return m;
}

/**
 * A whole session through time: burps at the burp demand and rests at the rest demand, each step
 * solved (warm-started from the last) with every bank's state of charge carried from step to step
 * (`advanceSoc`), so the alternators recharge the banks in the rests as far as their output and the
 * banks' charge acceptance allow. Reports the lowest amplifier voltage in each burp, each bank's
 * state of charge after it, how long the bus takes to come back to its resting voltage, and each
 * cable's adiabatic temperature over the session.
 */
export function runSession(
	doc: BuildDocument,
	scheduleIn: Partial<SessionSchedule> = {},
): SessionRun {
	const schedule: SessionSchedule = { ...DEFAULT_SESSION, ...scheduleIn };
	const burps = Math.max(0, Math.floor(schedule.burps));
	const base = { engineRpm: schedule.engineRpm, conductorTempC: schedule.conductorTempC };
	const burpNet = compileNetwork(doc, { ...base, demand: schedule.burpDemand });
	const restNet = compileNetwork(doc, { ...base, demand: schedule.restDemand });
	const soc: Record<string, number> = Object.fromEntries(
		doc.banks.map((b) => [b.id, b.stateOfCharge]),
	);
	const totalS = burps * (schedule.burpS + schedule.restS);
	const interval = Math.max(schedule.restStepS, totalS / 600);
	const trace: SessionRun['trace'] = {
		timeS: [],
		busV: [],
		lowestAmplifierV: [],
		soc: Object.fromEntries(doc.banks.map((b) => [b.id, []])),
	};
	const i2t = new Float64Array(doc.cables.length);
	let bucketEnd = interval;
	let bucketMin = Number.POSITIVE_INFINITY;
	let t = 0;
	let collapsedAtS: number | null = null;
	let warmBurp: Float64Array | undefined;
	let warmRest: Float64Array | undefined;

	/** One step of dt on a network: solve, integrate charge and heat, record. Returns the bus voltage. */
	const step = (net: CompiledNetwork, dt: number, warm: Float64Array | undefined) => {
		setBankStates(net, doc.banks, soc);
		// The capacitor banks' voltages carry from step to step, whichever network the step uses.
		net.capacitors.forEach((c, k) => (c.vcV = capV[k]!));
		beginCapacitorStep(net.capacitors, dt);
		const raw = solveCompiled(net, warm);
		const v = raw.v;
		endCapacitorStep(
			net.capacitors,
			(k) => at(v, net.capacitors[k]!.p) - at(v, net.capacitors[k]!.n),
			dt,
		);
		net.capacitors.forEach((c, k) => (capV[k] = c.vcV));
		net.banks.forEach((b, i) => {
			const [currentA] = bankCurrent(b, at(v, b.p) - at(v, b.n));
			const bank = doc.banks[i]!;
			soc[bank.id] = advanceSoc(bank, soc[bank.id]!, currentA, dt);
		});
		net.cables.forEach((c, i) => {
			const currentA = (at(v, c.p) - at(v, c.n)) * c.g;
			i2t[i] += currentA * currentA * dt;
		});
		t += dt;
		const bus = busVoltage(net, v);
		bucketMin = Math.min(bucketMin, lowestAmp(net, v));
		if (t >= bucketEnd - 1e-9) {
			trace.timeS.push(t);
			trace.busV.push(bus);
			trace.lowestAmplifierV.push(Number.isFinite(bucketMin) ? bucketMin : null);
			for (const b of doc.banks) trace.soc[b.id]!.push(soc[b.id]!);
			bucketMin = Number.POSITIVE_INFINITY;
			bucketEnd = t + interval;
		}
		if (raw.collapsed && collapsedAtS === null) collapsedAtS = t;
		return { v, bus, lowest: lowestAmp(net, v) };
	};

	setBankStates(restNet, doc.banks, soc);
	const rested = solveCompiled(restNet);
	const restingV = busVoltage(restNet, rested.v);
	// Charged at the resting point before the first burp.
	const capV = restNet.capacitors.map((c) => at(rested.v, c.p) - at(rested.v, c.n));
	warmRest = rested.v;

	const out: SessionBurp[] = [];
	for (let k = 0; k < burps && collapsedAtS === null; k++) {
		const startS = t;
		let lowest = Number.POSITIVE_INFINITY;
		const burpSteps = Math.max(1, Math.round(schedule.burpS / schedule.stepS));
		const dtBurp = schedule.burpS / burpSteps;
		for (let s = 0; s < burpSteps && collapsedAtS === null; s++) {
			const r = step(burpNet, dtBurp, warmBurp);
			warmBurp = r.v;
			lowest = Math.min(lowest, r.lowest);
		}
		const socAfter = { ...soc };
		let recoveryS: number | null = null;
		let busAfterRestV: number | null = null;
		const restSteps =
			schedule.restS > 0 ? Math.max(1, Math.round(schedule.restS / schedule.restStepS)) : 0;
		const dtRest = restSteps ? schedule.restS / restSteps : 0;
		for (let s = 0; s < restSteps && collapsedAtS === null; s++) {
			const r = step(restNet, dtRest, warmRest);
			warmRest = r.v;
			busAfterRestV = r.bus;
			// The rest step's solve is the state at the step's start: the bus right after the burp.
			if (recoveryS === null && r.bus >= restingV - RECOVERY_TOLERANCE_V) recoveryS = s * dtRest;
		}
		out.push({
			startS,
			lowestAmplifierV: Number.isFinite(lowest) ? lowest : null,
			socAfter,
			recoveryS,
			busAfterRestV,
		});
	}
	return {
		schedule,
		restingV,
		burps: out,
		collapsedAtS,
		endSoc: { ...soc },
		trace,
		cables: doc.cables.map((c, i) => {
			const { K, beta } = ADIABATIC_CONSTANTS[c.material];
			const area = cableAreaMm2(c.size) * c.parallelRuns;
			const exponent = area > 0 ? i2t[i]! / (K * K * area * area) : 0;
			const finalC = (schedule.conductorTempC + beta) * Math.exp(Math.min(exponent, 700)) - beta;
			return { id: c.id, finalC, limitC: c.insulationC };
		}),
	};
}

export interface PlayTime {
	/** Seconds of music with the engine off until the first bank reaches its cut-off; null beyond `maxS`. */
	seconds: number | null;
	/** What ended it. */
	endedBy: 'cutoff' | 'empty' | 'collapse' | 'limit';
	/** The run for a chart: the lowest amplifier voltage and the lowest bank terminal voltage. */
	trace: { timeS: number[]; lowestAmplifierV: Array<number | null>; lowestBankV: number[] };
}

/**
 * How long the banks carry music-level demand with the engine off: stepped through time with the
 * states of charge carried as in a session, until the first bank's terminal voltage falls to its
 * cut-off (`cutoffV`, or the chemistry's cut-off per cell × cells) or a bank is empty (0 %, for a
 * chemistry whose table still rests above the cut-off there), the network collapses, or
 * `maxS` passes. The crossing is interpolated inside the last step.
 */
export function engineOffPlayTime(
	doc: BuildDocument,
	opts: {
		demand: number;
		conductorTempC: number;
		cutoffV: number | null;
		stepS?: number;
		maxS?: number;
	},
): PlayTime {
	const stepS = opts.stepS ?? 10;
	const maxS = opts.maxS ?? 6 * 3600;
	const trace: PlayTime['trace'] = { timeS: [], lowestAmplifierV: [], lowestBankV: [] };
	if (doc.banks.length === 0) return { seconds: 0, endedBy: 'cutoff', trace };
	const net = compileNetwork(doc, {
		engineRpm: 0,
		demand: opts.demand,
		conductorTempC: opts.conductorTempC,
	});
	const cutoffs = doc.banks.map(
		(b) => opts.cutoffV ?? CHEMISTRY_PROPS[b.chemistry].cutoffPerCell * cellsInSeries(b),
	);
	const soc: Record<string, number> = Object.fromEntries(
		doc.banks.map((b) => [b.id, b.stateOfCharge]),
	);
	const every = Math.max(1, Math.round(maxS / stepS / 400));
	let warm: Float64Array | undefined;
	let prevMargin: number | null = null;
	for (let k = 0; k * stepS <= maxS; k++) {
		const t = k * stepS;
		setBankStates(net, doc.banks, soc);
		const raw = solveCompiled(net, warm);
		warm = raw.v;
		let margin = Number.POSITIVE_INFINITY;
		let lowestBank = Number.POSITIVE_INFINITY;
		net.banks.forEach((b, i) => {
			const x = at(raw.v, b.p) - at(raw.v, b.n);
			lowestBank = Math.min(lowestBank, x);
			margin = Math.min(margin, x - cutoffs[i]!);
		});
		if (k % every === 0 || raw.collapsed || margin <= 0) {
			const lowest = lowestAmp(net, raw.v);
			trace.timeS.push(t);
			trace.lowestAmplifierV.push(Number.isFinite(lowest) ? lowest : null);
			trace.lowestBankV.push(lowestBank);
		}
		if (raw.collapsed) return { seconds: t, endedBy: 'collapse', trace };
		if (margin <= 0) {
			// Linear between the last step above the cut-off and this one below it.
			const seconds =
				prevMargin === null || prevMargin <= margin
					? t
					: t - stepS + (stepS * prevMargin) / (prevMargin - margin);
			return { seconds, endedBy: 'cutoff', trace };
		}
		prevMargin = margin;
		// A bank whose chemistry still holds its voltage above the cut-off at 0 % is empty there.
		let emptyAfterS = Number.POSITIVE_INFINITY;
		net.banks.forEach((b, i) => {
			const [currentA] = bankCurrent(b, at(raw.v, b.p) - at(raw.v, b.n));
			const bank = doc.banks[i]!;
			const before = soc[bank.id]!;
			const unclamped = before - advanceSocRate(bank, currentA) * stepS;
			if (unclamped <= 0 && before > unclamped)
				emptyAfterS = Math.min(emptyAfterS, (stepS * before) / (before - unclamped));
			soc[bank.id] = advanceSoc(bank, before, currentA, stepS);
		});
		if (Number.isFinite(emptyAfterS)) return { seconds: t + emptyAfterS, endedBy: 'empty', trace };
	}
	return { seconds: null, endedBy: 'limit', trace };
}
