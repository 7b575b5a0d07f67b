import { amplifierDrawCurrent } from './amplifier';
import { capacitorBranchA, capacitorCurrent } from './capacitor';
import { alternatorCurrent, bankCurrent, isolatorCurrent } from './newton';
import { compileNetwork, type CompiledNetwork, type SolveConditions } from './network';
import { type RawSolution, solveCompiled } from './solver';
import type { BuildDocument } from './types';

export interface CableResult {
	id: string;
	/** Current from the cable's `from` end to its `to` end (A); negative when it flows the other way. */
	currentA: number;
	dropV: number;
	lossW: number;
	resistanceOhm: number;
}

export interface BankResult {
	id: string;
	/** Current out of the positive terminal (A): positive discharging, negative charging. */
	currentA: number;
	terminalV: number;
	ocvV: number;
	charging: boolean;
	/** True when the bank is charging at (or above) its charge acceptance: the regulator is above its absorption voltage. */
	chargeLimited: boolean;
	chargeAcceptanceA: number;
}

export interface AlternatorResult {
	id: string;
	currentA: number;
	limitA: number;
	terminalV: number;
	mode: 'off' | 'voltage' | 'current';
	/** Share of the current all sources deliver (0..1). */
	share: number;
}

export interface AmplifierResult {
	id: string;
	terminalV: number;
	currentA: number;
	inputPowerW: number;
}

export interface LoadResult {
	id: string;
	terminalV: number;
	currentA: number;
}

export interface IsolatorResult {
	id: string;
	/** Closed (or, for a diode, free to conduct) under these conditions. */
	closed: boolean;
	/** Current from its `from` end to its `to` end (A). */
	currentA: number;
	/** Voltage from `from` to `to` (V): the drop while it conducts, the gap it holds while open. */
	dropV: number;
	lossW: number;
}

export interface CapacitorResult {
	id: string;
	terminalV: number;
	/** Current out of its positive terminal (A): positive discharging; its leakage at a steady point. */
	currentA: number;
	/** The capacitor's own voltage behind its series resistance (V). */
	capacitorV: number;
}

export interface ChargerResult {
	id: string;
	/** It runs under these conditions. */
	running: boolean;
	outputA: number;
	outputV: number;
	inputA: number;
	inputV: number;
	/** It delivers its whole output limit: what it charges is bounded by the charger. */
	atLimit: boolean;
}

export interface NetworkSolution {
	status: 'ok' | 'collapse';
	/** Node voltages against the chassis (V). */
	nodeVoltages: Record<string, number>;
	cables: CableResult[];
	banks: BankResult[];
	alternators: AlternatorResult[];
	amplifiers: AmplifierResult[];
	loads: LoadResult[];
	capacitors: CapacitorResult[];
	chargers: ChargerResult[];
	/** Every relay and isolator of the document, in its order, open ones too. */
	isolators: IsolatorResult[];
	/** When status is 'collapse': the largest fraction of the requested demand with an operating point. */
	solvedDemandFraction: number;
	iterations: number;
	maxResidualA: number;
	/** Power into the network from sources, into loads, and lost in the wiring: cables, relays, isolators (W). */
	power: { sourcesW: number; loadsW: number; cableLossW: number };
}

export function describeSolution(net: CompiledNetwork, raw: RawSolution): NetworkSolution {
	const v = (i: number) => (i < 0 ? 0 : raw.v[i]!);
	const nodeVoltages: Record<string, number> = {};
	for (const [id, i] of net.index) nodeVoltages[id] = v(i);
	const cables = net.cables.map((c) => {
		const dropV = v(c.p) - v(c.n);
		const currentA = dropV * c.g;
		return { id: c.id, currentA, dropV, lossW: currentA * dropV, resistanceOhm: c.resistanceOhm };
	});
	const banks = net.banks.map((b) => {
		const terminalV = v(b.p) - v(b.n);
		const [currentA] = bankCurrent(b, terminalV);
		return {
			id: b.id,
			currentA,
			terminalV,
			ocvV: b.ocvV,
			charging: currentA < 0,
			chargeLimited: currentA < 0 && -currentA >= 0.999 * b.chargeAcceptanceA,
			chargeAcceptanceA: b.chargeAcceptanceA,
		};
	});
	const alternatorsRaw = net.alternators.map((a) => {
		const terminalV = v(a.p) - v(a.n);
		const [currentA] = alternatorCurrent(a, terminalV);
		const mode: AlternatorResult['mode'] =
			a.limitA <= 0 || currentA <= 0 ? 'off' : currentA >= a.limitA ? 'current' : 'voltage';
		return { id: a.id, currentA, limitA: a.limitA, terminalV, mode, share: 0 };
	});
	const totalOut =
		alternatorsRaw.reduce((s, a) => s + a.currentA, 0) +
		banks.reduce((s, b) => s + Math.max(0, b.currentA), 0);
	const alternators = alternatorsRaw.map((a) => ({
		...a,
		share: totalOut > 0 ? a.currentA / totalOut : 0,
	}));
	const amplifiers = net.amplifiers.map((a) => {
		const terminalV = v(a.p) - v(a.n);
		const [currentA] = amplifierDrawCurrent(a.draw, terminalV, raw.lambda);
		return { id: a.id, terminalV, currentA, inputPowerW: currentA * terminalV };
	});
	const loads = net.loads.map((l) => ({
		id: l.id,
		terminalV: v(l.p) - v(l.n),
		currentA: l.currentA,
	}));
	const capacitors = net.capacitors.map((c) => {
		const terminalV = v(c.p) - v(c.n);
		const branchA = capacitorBranchA(c, terminalV);
		return {
			id: c.id,
			terminalV,
			currentA: -capacitorCurrent(c, terminalV)[0],
			capacitorV: c.gStep > 0 ? terminalV - branchA * c.esrOhm : terminalV,
		};
	});
	const chargers = net.chargers.map(({ id, output, input }) => {
		const outputV = v(output.p) - v(output.n);
		const inputV = v(input.p) - v(input.n);
		const [outputA] = alternatorCurrent(output, outputV);
		const [inputA] = input.powerW > 0 ? amplifierDrawCurrent(input.draw, inputV, raw.lambda) : [0];
		return {
			id,
			running: output.limitA > 0,
			outputA,
			outputV,
			inputA,
			inputV,
			atLimit: output.limitA > 0 && outputA >= output.limitA * (1 - 1e-9),
		};
	});
	const sourcesW =
		chargers.reduce((s, c) => s + c.outputA * c.outputV, 0) +
		capacitors.reduce((s, c) => s + c.currentA * c.terminalV, 0) +
		banks.reduce((s, b) => s + b.currentA * b.terminalV, 0) +
		alternators.reduce((s, a) => s + a.currentA * a.terminalV, 0);
	const loadsW =
		chargers.reduce((s, c) => s + c.inputA * c.inputV, 0) +
		amplifiers.reduce((s, a) => s + a.inputPowerW, 0) +
		loads.reduce((s, l) => s + l.currentA * l.terminalV, 0);
	const closed = new Map(net.isolators.map((x) => [x.id, x]));
	const isolators = net.isolatorIds.map((id, k) => {
		const x = closed.get(id);
		const ends = net.isolatorEnds[k]!;
		const dropV = v(ends[0]) - v(ends[1]);
		const currentA = x ? isolatorCurrent(dropV, x)[0] : 0;
		return { id, closed: x !== undefined, currentA, dropV, lossW: currentA * dropV };
	});
	const cableLossW =
		cables.reduce((s, c) => s + c.lossW, 0) + isolators.reduce((s, x) => s + x.lossW, 0);
	return {
		status: raw.collapsed ? 'collapse' : 'ok',
		nodeVoltages,
		cables,
		banks,
		alternators,
		amplifiers,
		loads,
		capacitors,
		chargers,
		isolators,
		solvedDemandFraction: raw.lambda,
		iterations: raw.iterations,
		maxResidualA: raw.residualA,
		power: { sourcesW, loadsW, cableLossW },
	};
}

/**
 * Solves a build's DC network at an engine speed and demand level: node voltages, every cable's
 * current, drop and loss, each source's current and mode, and each amplifier's terminal voltage.
 * The topology must already be valid (see checkTopology).
 */
export function solveNetwork(doc: BuildDocument, conditions: SolveConditions): NetworkSolution {
	const net = compileNetwork(doc, conditions);
	return describeSolution(net, solveCompiled(net));
}
