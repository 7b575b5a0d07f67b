import {
	type AmplifierDraw,
	amplifierDraw,
	amplifierDrawCoContent,
	amplifierDrawCurrent,
} from './amplifier';
import { alternatorLimitA } from './alternator';
import { bankThevenin, chargeAcceptanceA } from './battery';
import { capacitorCurrent, compileCapacitor, type CompiledCapacitor } from './capacitor';
import { cableResistanceOhm } from './conductors';
import { EngineInputError } from './errors';
import { DenseSystem } from './linear';
import { type FactorResult, SparseLdl, type SymmetricSystem } from './sparse';
import { partsOf } from './part-kinds';
import type { BuildDocument, Isolator } from './types';

/** A tiny conductance from every node to the chassis (as SPICE's gmin) keeps the matrix regular. */
export const GMIN_S = 1e-9;
const MAX_ITERATIONS = 80;
const RESIDUAL_TOL_A = 1e-8;
/** Newton steps smaller than this are taken whole (the quadratic-convergence zone). */
const LOCAL_STEP_V = 1e-3;
/**
 * After a last step this small in the same operating modes, the pivots of that step's
 * factorisation answer the stability question: the Jacobian moved by far less than it would take
 * to change sign (a constant-power load's slope changes by 2·ΔV/V of itself).
 */
const SETTLED_STEP_V = 1e-6;
/**
 * Smallest move the line search tries (V), in absolute terms: a source at its limit with a
 * micro-ohm resistance has a linear region only microvolts wide, so a relative floor on the step
 * fraction would give up on a Newton step of 1e11 V long before the line reaches it.
 */
const MIN_MOVE_V = 1e-13;

export interface SolveConditions {
	/** Engine speed (rpm); 0 = engine off. */
	engineRpm: number;
	/** Fraction of rated power every amplifier draws (1 = burp). */
	demand: number;
	/** Conductor temperature for cable resistance (°C). */
	conductorTempC: number;
	/** Per-bank state of charge, overriding the document (used by the time-stepped burp). */
	stateOfCharge?: Readonly<Record<string, number>>;
}

interface TwoTerminal {
	p: number; // node index, -1 = chassis
	n: number;
	/** Slots of the element's Jacobian entries (p,p), (n,n) and (p,n); -1 where a terminal is the chassis. */
	spp: number;
	snn: number;
	spn: number;
}

/** Buffers one network's solves reuse (Newton iterations, time steps): allocated once. */
interface Workspace {
	f: Float64Array;
	step: Float64Array;
	trial: Float64Array;
	/** Each bank's and alternator's operating mode at the last assembly, and at the last factorisation. */
	modes: Int8Array;
	factoredModes: Int8Array;
	/** Lowest amplifier terminal voltage seen; non-positive means no physical solution here. */
	minAmpV: number;
}

/** The network reduced to numbers: node indices and per-element parameters. */
export interface CompiledNetwork {
	nodeIds: string[];
	index: Map<string, number>;
	cables: Array<TwoTerminal & { id: string; g: number; resistanceOhm: number }>;
	banks: Array<
		TwoTerminal & {
			id: string;
			ocvV: number;
			resistanceOhm: number;
			chargeResistanceOhm: number;
			chargeAcceptanceA: number;
		}
	>;
	alternators: Array<
		TwoTerminal & { id: string; setPointV: number; resistanceOhm: number; limitA: number }
	>;
	/** `powerW` is the input power at and below the rated voltage; `draw` how it grows above. */
	amplifiers: Array<TwoTerminal & { id: string; powerW: number; draw: AmplifierDraw }>;
	loads: Array<TwoTerminal & { id: string; currentA: number }>;
	/**
	 * Relays and isolators that conduct under these conditions (an open one joins nothing): a
	 * conductance `g`, and for a diode a forward drop below which it carries nothing.
	 */
	isolators: Array<TwoTerminal & { id: string; g: number; dropV: number; diode: boolean }>;
	/** Capacitor banks: open but for their leakage at a steady point; companion branches in a step. */
	capacitors: Array<TwoTerminal & CompiledCapacitor>;
	/**
	 * DC-DC chargers: the output a source toward its target up to its limit (as an alternator is;
	 * limit 0 while it does not run), the input a constant-power draw of the output power over the
	 * efficiency, settled by `solveCompiled`'s outer iteration.
	 */
	chargers: Array<{
		id: string;
		efficiency: number;
		output: TwoTerminal & { id: string; setPointV: number; resistanceOhm: number; limitA: number };
		input: TwoTerminal & { powerW: number; draw: AmplifierDraw };
	}>;
	/** Every isolator's id and node indices (from, to), open ones too: what results report. */
	isolatorIds: string[];
	isolatorEnds: Array<readonly [number, number]>;
	/** Highest source voltage: the scale for initial guesses and collapse checks. */
	nominalV: number;
	/** The nodal Jacobian's pattern and factorisation, made once per network. */
	system: SymmetricSystem;
	/** Slot of each node's diagonal entry. */
	diagSlot: Int32Array;
	work: Workspace;
}

/**
 * Reduces a build to numbers for the solver. `linear: 'dense'` holds the Jacobian dense (the
 * reference the sparse factorisation is tested against); the default is sparse LDLᵀ with a
 * minimum-degree order.
 */
export function compileNetwork(
	doc: BuildDocument,
	conditions: SolveConditions,
	opts: { linear?: 'sparse' | 'dense' } = {},
): CompiledNetwork {
	const chassis = doc.nodes.find((n) => n.kind === 'chassis');
	const nodeIds = doc.nodes.filter((n) => n !== chassis).map((n) => n.id);
	const index = new Map(nodeIds.map((id, i) => [id, i]));
	if (chassis) index.set(chassis.id, -1);
	const at = (id: string, path: string) => {
		const i = index.get(id);
		if (i === undefined) throw new EngineInputError([{ path, message: `No node named "${id}"` }]);
		return i;
	};
	const banks = doc.banks.map((b, k) => {
		const soc = conditions.stateOfCharge?.[b.id] ?? b.stateOfCharge;
		const th = bankThevenin(b, soc);
		const acceptA = chargeAcceptanceA(b, soc);
		return {
			id: b.id,
			p: at(b.positive, `banks.${k}.positive`),
			n: at(b.negative, `banks.${k}.negative`),
			...NO_SLOTS,
			ocvV: th.ocvV,
			resistanceOhm: th.resistanceOhm,
			// A charging bank presents its own internal resistance (one Thevenin source and resistance
			// whichever way the current flows); its charge acceptance is a limit on the current, not a
			// steeper slope, so two banks at different states of charge exchange the Millman current
			// their resistances allow, up to what the charging one accepts.
			chargeResistanceOhm: th.resistanceOhm,
			chargeAcceptanceA: acceptA,
		};
	});
	const alternators = doc.alternators.map((a, k) => ({
		id: a.id,
		p: at(a.positive, `alternators.${k}.positive`),
		n: at(a.negative, `alternators.${k}.negative`),
		...NO_SLOTS,
		setPointV: a.setPointV,
		resistanceOhm: a.sourceResistanceOhm,
		limitA: alternatorLimitA(a, conditions.engineRpm),
	}));
	const nominalV = Math.max(
		1,
		...banks.map((b) => b.ocvV),
		...alternators.filter((a) => a.limitA > 0).map((a) => a.setPointV),
	);
	const cables = doc.cables.map((c, k) => {
		const r = cableResistanceOhm(c, conditions.conductorTempC);
		return {
			id: c.id,
			p: at(c.from, `cables.${k}.from`),
			n: at(c.to, `cables.${k}.to`),
			g: 1 / r,
			resistanceOhm: r,
			...NO_SLOTS,
		};
	});
	const amplifiers = doc.amplifiers.map((a, k) => {
		const draw = amplifierDraw(a, conditions.demand);
		const terminals = {
			p: at(a.positive, `amplifiers.${k}.positive`),
			n: at(a.negative, `amplifiers.${k}.negative`),
			...NO_SLOTS,
		};
		return { id: a.id, ...terminals, powerW: draw.powerW, draw };
	});
	const loads = doc.loads.map((l, k) => ({
		id: l.id,
		p: at(l.positive, `loads.${k}.positive`),
		n: at(l.negative, `loads.${k}.negative`),
		currentA: l.currentA,
		...NO_SLOTS,
	}));
	const allIsolators = partsOf(doc, 'isolators');
	const isolatorEnds = allIsolators.map(
		(x, k) => [at(x.from, `isolators.${k}.from`), at(x.to, `isolators.${k}.to`)] as const,
	);
	const isolators = allIsolators.flatMap((x, k) =>
		conducts(x, conditions.engineRpm)
			? [
					{
						id: x.id,
						p: isolatorEnds[k]![0],
						n: isolatorEnds[k]![1],
						...NO_SLOTS,
						g: 1 / x.closedResistanceOhm,
						dropV: x.kind === 'diode' ? x.forwardDropV : 0,
						diode: x.kind === 'diode',
					},
				]
			: [],
	);
	const capacitors = partsOf(doc, 'capacitors').map((c, k) => ({
		...compileCapacitor(c),
		p: at(c.positive, `capacitors.${k}.positive`),
		n: at(c.negative, `capacitors.${k}.negative`),
		...NO_SLOTS,
	}));
	const chassisIndex = -1;
	const chargers = partsOf(doc, 'chargers').map((c, k) => ({
		id: c.id,
		efficiency: c.efficiency,
		output: {
			id: c.id,
			p: at(c.to, `chargers.${k}.to`),
			n: chassisIndex,
			...NO_SLOTS,
			setPointV: c.targetV,
			resistanceOhm: CHARGER_SOURCE_OHM,
			limitA: conducts({ closes: c.runs }, conditions.engineRpm) ? c.maxOutputA : 0,
		},
		input: {
			p: at(c.from, `chargers.${k}.from`),
			n: chassisIndex,
			...NO_SLOTS,
			powerW: 0,
			draw: { powerW: 0, ratedVoltageV: Infinity, maxPowerW: Infinity },
		},
	}));
	const elements: TwoTerminal[] = [
		...chargers.flatMap((c) => [c.output, c.input]),
		...capacitors,
		...cables,
		...banks,
		...alternators,
		...amplifiers,
		...loads,
		...isolators,
	];
	const n = nodeIds.length;
	const system: SymmetricSystem =
		opts.linear === 'dense'
			? new DenseSystem(n)
			: new SparseLdl(
					n,
					elements.map((e) => [e.p, e.n] as const),
				);
	for (const e of elements) {
		e.spp = system.slot(e.p, e.p);
		e.snn = system.slot(e.n, e.n);
		e.spn = e.p === e.n ? -1 : system.slot(e.p, e.n);
	}
	const modeCount = banks.length + alternators.length + isolators.length + chargers.length;
	return {
		nodeIds,
		index,
		cables,
		banks,
		alternators,
		amplifiers,
		loads,
		isolators,
		capacitors,
		chargers,
		isolatorIds: allIsolators.map((x) => x.id),
		isolatorEnds,
		nominalV,
		system,
		diagSlot: Int32Array.from({ length: n }, (_, i) => system.slot(i, i)),
		work: {
			f: new Float64Array(n),
			step: new Float64Array(n),
			trial: new Float64Array(n),
			modes: new Int8Array(modeCount),
			factoredModes: new Int8Array(modeCount),
			minAmpV: 0,
		},
	};
}

const NO_SLOTS = { spp: -1, snn: -1, spn: -1 };

/** A DC-DC charger's output stiffness in voltage mode (Ω): small, as a regulator's. */
export const CHARGER_SOURCE_OHM = 0.001;

/** Whether a relay or isolator is closed at this engine speed (0 = engine off). */
export function conducts(x: Pick<Isolator, 'closes'>, engineRpm: number): boolean {
	return x.closes === 'always' || (x.closes === 'engine_running' && engineRpm > 0);
}

/**
 * Current from a closed isolator's `from` end to its `to` end at voltage x across it, and dI/dx:
 * a relay is a resistance both ways; a diode conducts forward only, past its drop, through its
 * slope resistance (the piecewise-linear diode model).
 */
export function isolatorCurrent(
	x: number,
	iso: CompiledNetwork['isolators'][number],
): [number, number] {
	if (!iso.diode) return [iso.g * x, iso.g];
	// The knee belongs to the conducting side, as the banks' and alternators' knees do.
	return x >= iso.dropV ? [iso.g * (x - iso.dropV), iso.g] : [0, 0];
}

const volt = (v: Float64Array, i: number) => (i < 0 ? 0 : v[i]!);

/**
 * Current out of a bank's positive terminal at terminal voltage v, and its derivative dI/dv:
 * (V_oc − v)/R discharging; charging (V_oc − v)/R_charge until the bank takes its charge
 * acceptance, then exactly that (a limit, like an alternator's).
 */
export function bankCurrent(b: CompiledNetwork['banks'][number], v: number): [number, number] {
	if (v <= b.ocvV) return [(b.ocvV - v) / b.resistanceOhm, -1 / b.resistanceOhm];
	const i = (b.ocvV - v) / b.chargeResistanceOhm;
	// Each boundary belongs to the side with a slope: a Newton step that lands exactly on a knee
	// (it does, when a limited step is halved onto a set point) must still see the source there.
	if (-i > b.chargeAcceptanceA) return [-b.chargeAcceptanceA, 0];
	return [i, -1 / b.chargeResistanceOhm];
}

/** Current out of an alternator: a voltage source at its set point until its limit, never negative. */
export function alternatorCurrent(
	a: CompiledNetwork['alternators'][number],
	v: number,
): [number, number] {
	if (a.limitA <= 0) return [0, 0];
	const i = (a.setPointV - v) / a.resistanceOhm;
	if (i < 0) return [0, 0];
	if (i > a.limitA) return [a.limitA, 0];
	return [i, -1 / a.resistanceOhm];
}

/** Operating mode codes for the mode signature (a change means the Jacobian's form changed). */
function bankMode(b: CompiledNetwork['banks'][number], x: number): number {
	if (x <= b.ocvV) return 0;
	return -(b.ocvV - x) / b.chargeResistanceOhm > b.chargeAcceptanceA ? 2 : 1;
}

function alternatorMode(a: CompiledNetwork['alternators'][number], x: number): number {
	if (a.limitA <= 0) return 0;
	const i = (a.setPointV - x) / a.resistanceOhm;
	return i < 0 ? 0 : i > a.limitA ? 2 : 1;
}

/**
 * Adds a two-terminal element drawing `cur` into p (out of n) with incremental conductance `g` to
 * the residual `f` and the Jacobian's values `j` (a module function: assembly runs thousands of
 * times a burp, and a closure per call would be made as often).
 */
function stamp(f: Float64Array, j: Float64Array, e: TwoTerminal, cur: number, g: number) {
	if (e.p >= 0) {
		f[e.p] += cur;
		j[e.spp] += g;
	}
	if (e.n >= 0) {
		f[e.n] -= cur;
		j[e.snn] += g;
	}
	if (e.spn >= 0) j[e.spn] -= g;
}

/** Residual f (current out of each node) into `net.work.f` and the Jacobian into `net.system`. */
function assemble(net: CompiledNetwork, v: Float64Array, lambda: number) {
	const n = net.nodeIds.length;
	const { work, system, diagSlot } = net;
	const f = work.f;
	const j = system.values;
	system.clear();
	for (let i = 0; i < n; i++) {
		f[i] = GMIN_S * v[i]!;
		j[diagSlot[i]!] += GMIN_S;
	}
	for (const c of net.cables) stamp(f, j, c, c.g * (volt(v, c.p) - volt(v, c.n)), c.g);
	let m = 0;
	for (const b of net.banks) {
		const x = volt(v, b.p) - volt(v, b.n);
		const [i, di] = bankCurrent(b, x);
		stamp(f, j, b, -i, -di);
		work.modes[m++] = bankMode(b, x);
	}
	for (const a of net.alternators) {
		const x = volt(v, a.p) - volt(v, a.n);
		const [i, di] = alternatorCurrent(a, x);
		stamp(f, j, a, -i, -di);
		work.modes[m++] = alternatorMode(a, x);
	}
	let minAmpV = Number.POSITIVE_INFINITY;
	for (const a of net.amplifiers) {
		const vpn = volt(v, a.p) - volt(v, a.n);
		minAmpV = Math.min(minAmpV, vpn);
		if (a.powerW === 0) continue;
		const [i, di] = amplifierDrawCurrent(a.draw, vpn, lambda);
		stamp(f, j, a, i, di);
	}
	for (const l of net.loads) stamp(f, j, l, l.currentA, 0);
	for (const c of net.capacitors) {
		const [i, di] = capacitorCurrent(c, volt(v, c.p) - volt(v, c.n));
		stamp(f, j, c, i, di);
	}
	for (const { output, input } of net.chargers) {
		const x = volt(v, output.p) - volt(v, output.n);
		const [i, di] = alternatorCurrent(output, x);
		stamp(f, j, output, -i, -di);
		work.modes[m++] = alternatorMode(output, x);
		if (input.powerW > 0) {
			const [ii, dii] = amplifierDrawCurrent(
				input.draw,
				volt(v, input.p) - volt(v, input.n),
				lambda,
			);
			stamp(f, j, input, ii, dii);
		}
	}
	for (const x of net.isolators) {
		const vx = volt(v, x.p) - volt(v, x.n);
		const [i, di] = isolatorCurrent(vx, x);
		stamp(f, j, x, i, di);
		work.modes[m++] = x.diode && vx >= x.dropV ? 1 : 0;
	}
	work.minAmpV = minAmpV;
}

function sameModes(a: Int8Array, b: Int8Array): boolean {
	for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
	return true;
}

/**
 * The network's co-content: a scalar whose gradient is the nodal residual f. Cables, sources and
 * loads are monotone, so without amplifiers it is convex; near a stable operating point it is
 * locally convex too. The Newton step is line-searched on it, which copes with the kinks where an
 * alternator reaches its limit or a bank its charge acceptance. Amplifier terminals below `floorV`
 * count as infinitely bad: that side of the curve is the collapsed, low-voltage branch.
 */
function coContent(net: CompiledNetwork, v: Float64Array, lambda: number, floorV: number): number {
	let e = 0;
	for (let i = 0; i < v.length; i++) e += 0.5 * GMIN_S * v[i]! ** 2;
	for (const c of net.cables) e += 0.5 * c.g * (volt(v, c.p) - volt(v, c.n)) ** 2;
	for (const b of net.banks) {
		const x = volt(v, b.p) - volt(v, b.n);
		if (x <= b.ocvV) e += (x - b.ocvV) ** 2 / (2 * b.resistanceOhm);
		else {
			// Charging: quadratic up to the acceptance knee, linear past it (the current is capped).
			const knee = b.ocvV + b.chargeResistanceOhm * b.chargeAcceptanceA;
			e +=
				x < knee
					? (x - b.ocvV) ** 2 / (2 * b.chargeResistanceOhm)
					: (b.chargeResistanceOhm * b.chargeAcceptanceA ** 2) / 2 +
						b.chargeAcceptanceA * (x - knee);
		}
	}
	for (const a of net.alternators) {
		if (a.limitA <= 0) continue;
		const x = volt(v, a.p) - volt(v, a.n);
		const knee = a.setPointV - a.resistanceOhm * a.limitA;
		if (x >= a.setPointV) continue;
		e +=
			x > knee
				? (x - a.setPointV) ** 2 / (2 * a.resistanceOhm)
				: (a.resistanceOhm * a.limitA ** 2) / 2 - a.limitA * (x - knee);
	}
	for (const a of net.amplifiers) {
		const x = volt(v, a.p) - volt(v, a.n);
		if (lambda * a.powerW === 0) continue;
		if (x < floorV) return Number.POSITIVE_INFINITY;
		e += amplifierDrawCoContent(a.draw, x, lambda);
	}
	for (const l of net.loads) e += l.currentA * (volt(v, l.p) - volt(v, l.n));
	for (const c of net.capacitors) {
		const x = volt(v, c.p) - volt(v, c.n);
		e += 0.5 * c.gLeak * x * x + 0.5 * c.gStep * (x - c.vcV) ** 2;
	}
	for (const { output: a, input } of net.chargers) {
		if (a.limitA > 0) {
			const x = volt(v, a.p) - volt(v, a.n);
			const knee = a.setPointV - a.resistanceOhm * a.limitA;
			if (x < a.setPointV)
				e +=
					x > knee
						? (x - a.setPointV) ** 2 / (2 * a.resistanceOhm)
						: (a.resistanceOhm * a.limitA ** 2) / 2 - a.limitA * (x - knee);
		}
		if (lambda * input.powerW === 0) continue;
		const x = volt(v, input.p) - volt(v, input.n);
		if (x < floorV) return Number.POSITIVE_INFINITY;
		e += amplifierDrawCoContent(input.draw, x, lambda);
	}
	for (const x of net.isolators) {
		const over = volt(v, x.p) - volt(v, x.n) - x.dropV;
		if (!x.diode || over > 0) e += 0.5 * x.g * over * over;
	}
	return e;
}

interface NewtonResult {
	ok: boolean;
	v: Float64Array;
	iterations: number;
	residualA: number;
}

function maxAbs(x: Float64Array): number {
	let m = 0;
	for (let i = 0; i < x.length; i++) m = Math.max(m, Math.abs(x[i]!));
	return m;
}

/**
 * Newton iteration from `start`, line-searched on the co-content. One symmetric factorisation per
 * iteration gives the step, and its pivots say whether the Jacobian is positive definite: at the
 * converged point that is the stability test (no separate one unless the last step was large or
 * crossed into other operating modes).
 */
function newton(
	net: CompiledNetwork,
	lambda: number,
	start: Float64Array,
	exactLine = false,
): NewtonResult {
	const n = net.nodeIds.length;
	const { work, system } = net;
	const { f, step, trial } = work;
	const v = new Float64Array(start);
	const floorV = 0.02 * net.nominalV;
	let lastFactor: FactorResult | null = null;
	let lastStepV = Number.POSITIVE_INFINITY;
	for (let iter = 1; iter <= MAX_ITERATIONS; iter++) {
		assemble(net, v, lambda);
		if (lambda > 0 && work.minAmpV < floorV)
			return { ok: false, v, iterations: iter, residualA: Number.NaN };
		const residual = maxAbs(f);
		if (residual < RESIDUAL_TOL_A) {
			const settled =
				lastFactor !== null &&
				lastStepV < SETTLED_STEP_V &&
				sameModes(work.modes, work.factoredModes);
			const verdict = settled ? lastFactor : system.factor();
			return { ok: verdict === 'positive-definite', v, iterations: iter, residualA: residual };
		}
		for (let i = 0; i < n; i++) step[i] = -f[i]!;
		const verdict = system.factor();
		if (verdict === 'singular') return { ok: false, v, iterations: iter, residualA: residual };
		system.solve(step);
		lastFactor = verdict;
		work.factoredModes.set(work.modes);
		// Directional derivative of the co-content along the step.
		let slope = 0;
		for (let i = 0; i < n; i++) slope += f[i]! * step[i]!;
		if (!(slope < 0)) return { ok: false, v, iterations: iter, residualA: residual };
		// Voltage limiting (as SPICE limits junction steps): where every source is at a limit the
		// Jacobian is only the background conductance and the raw step runs to ~1e11 V; a step longer
		// than the network's own voltage scale carries no information beyond its direction.
		let stepSize = maxAbs(step);
		const maxStepV = Math.max(1, net.nominalV);
		if (stepSize > maxStepV) {
			const k = maxStepV / stepSize;
			for (let i = 0; i < n; i++) step[i] = step[i]! * k;
			slope *= k;
			stepSize = maxStepV;
		}
		let t = 1;
		// Close to the solution Newton converges quadratically; the co-content's differences are then
		// below its rounding, so a line search would only stall. Far from it, search the line.
		if (stepSize > LOCAL_STEP_V) {
			const e0 = coContent(net, v, lambda, floorV);
			const at = (x: number) => {
				for (let i = 0; i < n; i++) trial[i] = v[i]! + x * step[i]!;
				return coContent(net, trial, lambda, floorV);
			};
			// Backtrack to sufficient decrease, then keep halving while that still lowers the co-content.
			let e = at(t);
			while (!(e <= e0 + 1e-4 * t * slope) && t * stepSize > MIN_MOVE_V) {
				t /= 2;
				e = at(t);
			}
			if (t * stepSize <= MIN_MOVE_V)
				return { ok: false, v, iterations: iter, residualA: residual };
			for (let k = 0; k < 60; k++) {
				const eHalf = at(t / 2);
				if (!(eHalf < e)) break;
				t /= 2;
				e = eHalf;
			}
			if (exactLine) {
				// Where a source flips between its limit and off on successive steps (its linear region
				// microvolts wide), halving alone overshoots the kink every time and the iteration
				// ping-pongs. A golden-section search for the line's minimum (the co-content is convex
				// along it for the unloaded network, and locally near a stable point) lands on the kink.
				let lo = 0;
				let hi = 1;
				const g = (Math.sqrt(5) - 1) / 2;
				let x1 = hi - g * (hi - lo);
				let x2 = lo + g * (hi - lo);
				let e1 = at(x1);
				let e2 = at(x2);
				while ((hi - lo) * stepSize > MIN_MOVE_V && hi - lo > 1e-12) {
					if (e1 <= e2) {
						hi = x2;
						x2 = x1;
						e2 = e1;
						x1 = hi - g * (hi - lo);
						e1 = at(x1);
					} else {
						lo = x1;
						x1 = x2;
						e1 = e2;
						x2 = lo + g * (hi - lo);
						e2 = at(x2);
					}
				}
				const tg = e1 <= e2 ? x1 : x2;
				const eg = Math.min(e1, e2);
				if (eg < e) {
					t = tg;
					e = eg;
				}
			}
		} else if (lambda > 0) {
			for (let i = 0; i < n; i++) trial[i] = v[i]! + step[i]!;
			if (coContent(net, trial, lambda, floorV) === Number.POSITIVE_INFINITY)
				return { ok: false, v, iterations: iter, residualA: residual };
		}
		for (let i = 0; i < n; i++) v[i] = v[i]! + t * step[i]!;
		lastStepV = t * stepSize;
	}
	return { ok: false, v, iterations: MAX_ITERATIONS, residualA: Number.NaN };
}

export interface RawSolution {
	/** Node voltages by index (chassis excluded). */
	v: Float64Array;
	/** Fraction of the requested amplifier demand actually solved (1 unless the system collapses). */
	lambda: number;
	collapsed: boolean;
	iterations: number;
	residualA: number;
}

/**
 * A starting point on the loaded side: every bank discharging through its internal resistance,
 * every alternator at its current limit, and each amplifier replaced by the conductance it would
 * have at the lowest bank voltage. When an alternator saturates while a bank is charging, the
 * stable operating point can jump to this side, out of reach of a path that starts unloaded.
 */
function dischargeGuess(net: CompiledNetwork, lambda: number): Float64Array | null {
	const n = net.nodeIds.length;
	const { system, diagSlot } = net;
	const j = system.values;
	const b = new Float64Array(n);
	system.clear();
	for (let i = 0; i < n; i++) j[diagSlot[i]!] += GMIN_S;
	const stampG = (e: TwoTerminal, g: number) => {
		if (e.spp >= 0) j[e.spp] += g;
		if (e.snn >= 0) j[e.snn] += g;
		if (e.spn >= 0) j[e.spn] -= g;
	};
	const inject = (e: TwoTerminal, amps: number) => {
		if (e.p >= 0) b[e.p] += amps;
		if (e.n >= 0) b[e.n] -= amps;
	};
	for (const c of net.cables) stampG(c, c.g);
	for (const bank of net.banks) {
		stampG(bank, 1 / bank.resistanceOhm);
		inject(bank, bank.ocvV / bank.resistanceOhm);
	}
	for (const a of net.alternators) inject(a, a.limitA);
	const vRef = Math.min(net.nominalV, ...net.banks.map((x) => x.ocvV));
	for (const a of net.amplifiers) stampG(a, (lambda * a.powerW) / (vRef * vRef));
	for (const l of net.loads) inject(l, -l.currentA);
	for (const c of net.capacitors) {
		stampG(c, c.gLeak + c.gStep);
		inject(c, c.gStep * c.vcV);
	}
	for (const { output, input } of net.chargers) {
		inject(output, output.limitA);
		stampG(input, (lambda * input.powerW) / (vRef * vRef));
	}
	// A diode taken as conducting: its conductance, and its drop as a source pushing back.
	for (const x of net.isolators) {
		stampG(x, x.g);
		if (x.dropV > 0) inject(x, x.g * x.dropV);
	}
	if (system.factor() === 'singular') return null;
	system.solve(b);
	return b;
}

function minAmplifierVoltage(net: CompiledNetwork, v: Float64Array): number {
	let m = Number.POSITIVE_INFINITY;
	for (const a of net.amplifiers) m = Math.min(m, volt(v, a.p) - volt(v, a.n));
	return m;
}

/**
 * Solves the compiled network by nodal analysis with Newton iteration. Starts from `start` when
 * given (warm start), otherwise from the unloaded network. When the full demand has no stable
 * operating point the demand is ramped from zero (continuation) to find the largest fraction that
 * still has one: the voltage-collapse point.
 */
function solveOnce(net: CompiledNetwork, start?: Float64Array): RawSolution {
	const n = net.nodeIds.length;
	let iterations = 0;
	const attempt = (
		lambda: number,
		from: Float64Array | null,
		exactLine = false,
	): NewtonResult | null => {
		if (!from) return null;
		const r = newton(net, lambda, from, exactLine);
		iterations += r.iterations;
		return r.ok ? r : null;
	};
	if (start) {
		const warm = attempt(1, start);
		if (warm)
			return { v: warm.v, lambda: 1, collapsed: false, iterations, residualA: warm.residualA };
	}
	const first = new Float64Array(n).fill(net.nominalV * 0.5);
	let unloaded = newton(net, 0, first);
	iterations += unloaded.iterations;
	if (!unloaded.ok) {
		unloaded = newton(net, 0, first, true);
		iterations += unloaded.iterations;
	}
	// With no amplifier drawing, the co-content is strictly convex (every element is monotone and
	// the background conductance is positive), so a minimum exists and the damped, step-limited
	// Newton finds it; were it ever not found, the caller hears why, not a bare exception.
	if (!unloaded.ok)
		throw new EngineInputError([
			{
				path: '',
				message:
					'The network did not settle even with every amplifier off: look for sources whose limits fight each other (set points, charge limits)',
			},
		]);
	// The same network with every bank on its discharge resistance both ways has no soft charging
	// side, so its stable point moves smoothly with demand; where banks end up discharging it is
	// also the real network's solution, and a good start for it in any case.
	const stiffBanks: CompiledNetwork = {
		...net,
		banks: net.banks.map((b) => ({ ...b, chargeResistanceOhm: b.resistanceOhm })),
	};
	const fromStiff = (lambda: number) => {
		const guess = dischargeGuess(net, lambda);
		if (!guess) return null;
		const r = newton(stiffBanks, lambda, guess);
		iterations += r.iterations;
		return r.ok ? r.v : null;
	};
	/** Stable solutions at λ from the given start and from the discharge side; the higher one wins. */
	const best = (lambda: number, from: Float64Array) => {
		const a = attempt(lambda, from);
		const b = attempt(lambda, dischargeGuess(net, lambda)) ?? attempt(lambda, fromStiff(lambda));
		if (a && b) return minAmplifierVoltage(net, b.v) > minAmplifierVoltage(net, a.v) + 1e-6 ? b : a;
		return a ?? b;
	};
	// Before concluding the demand is too much, try once more with the exact line search (a
	// source flipping between limit and off can stall the cheaper one short of a real solution).
	const direct = best(1, unloaded.v) ?? attempt(1, unloaded.v, true);
	if (direct)
		return { v: direct.v, lambda: 1, collapsed: false, iterations, residualA: direct.residualA };

	// No stable point at full demand: ramp the demand up from zero to find where it runs out.
	let lambda = 0;
	let v = unloaded.v;
	let residualA = unloaded.residualA;
	let step = 0.25;
	while (step > 1e-5 && lambda < 1) {
		const next = Math.min(1, lambda + step);
		const found = best(next, v);
		if (found) {
			lambda = next;
			v = found.v;
			residualA = found.residualA;
			step *= 1.5;
		} else {
			step /= 2;
		}
	}
	return { v, lambda, collapsed: lambda < 1, iterations, residualA };
}

/** Largest change in a charger's input power (W, relative to it) the outer iteration accepts. */
const CHARGER_POWER_TOL = 1e-10;

/**
 * Solves the compiled network (see `solveOnce`). A DC-DC charger couples its input to its output,
 * which the symmetric nodal system cannot hold: its input is a constant-power draw of the last
 * solution's output power over the efficiency, and the network is solved again until that power
 * stops changing (a fixed point; the output barely depends on the input, so a few rounds do).
 */
export function solveCompiled(net: CompiledNetwork, start?: Float64Array): RawSolution {
	let raw = solveOnce(net, start);
	for (let round = 0; round < 50 && net.chargers.length > 0; round++) {
		let change = 0;
		for (const { output, input, efficiency } of net.chargers) {
			const x = volt(raw.v, output.p) - volt(raw.v, output.n);
			const powerW = (Math.max(0, alternatorCurrent(output, x)[0]) * x) / efficiency;
			change = Math.max(change, Math.abs(powerW - input.powerW) / Math.max(1, powerW));
			input.powerW = powerW;
			input.draw.powerW = powerW;
		}
		if (change <= CHARGER_POWER_TOL) break;
		raw = solveOnce(net, raw.v);
	}
	return raw;
}
