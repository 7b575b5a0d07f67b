import {
	type AmplifierDraw,
	amplifierDraw,
	amplifierDrawCoContent,
	amplifierDrawCurrent,
} from './amplifier';
import { alternatorLimitA } from './alternator';
import { bankThevenin, chargeAcceptanceA } from './battery';
import { cableResistanceOhm } from './conductors';
import { solveDense } from './linear';
import type { BuildDocument } from './types';

/** A tiny conductance from every node to the chassis (as SPICE's gmin) keeps the matrix regular. */
export const GMIN_S = 1e-9;
const MAX_ITERATIONS = 80;
const RESIDUAL_TOL_A = 1e-8;
/** Newton steps smaller than this are taken whole (the quadratic-convergence zone). */
const LOCAL_STEP_V = 1e-3;

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
	/** Highest source voltage: the scale for initial guesses and collapse checks. */
	nominalV: number;
}

export function compileNetwork(doc: BuildDocument, conditions: SolveConditions): CompiledNetwork {
	const chassis = doc.nodes.find((n) => n.kind === 'chassis');
	const nodeIds = doc.nodes.filter((n) => n !== chassis).map((n) => n.id);
	const index = new Map(nodeIds.map((id, i) => [id, i]));
	if (chassis) index.set(chassis.id, -1);
	const at = (id: string) => {
		const i = index.get(id);
		if (i === undefined) throw new Error(`unknown node ${id}`);
		return i;
	};
	const banks = doc.banks.map((b) => {
		const soc = conditions.stateOfCharge?.[b.id] ?? b.stateOfCharge;
		const th = bankThevenin(b, soc);
		const acceptA = chargeAcceptanceA(b, soc);
		return {
			id: b.id,
			p: at(b.positive),
			n: at(b.negative),
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
	const alternators = doc.alternators.map((a) => ({
		id: a.id,
		p: at(a.positive),
		n: at(a.negative),
		setPointV: a.setPointV,
		resistanceOhm: a.sourceResistanceOhm,
		limitA: alternatorLimitA(a, conditions.engineRpm),
	}));
	const nominalV = Math.max(
		1,
		...banks.map((b) => b.ocvV),
		...alternators.filter((a) => a.limitA > 0).map((a) => a.setPointV),
	);
	return {
		nodeIds,
		index,
		cables: doc.cables.map((c) => {
			const r = cableResistanceOhm(c, conditions.conductorTempC);
			return { id: c.id, p: at(c.from), n: at(c.to), g: 1 / r, resistanceOhm: r };
		}),
		banks,
		alternators,
		amplifiers: doc.amplifiers.map((a) => {
			const draw = amplifierDraw(a, conditions.demand);
			return { id: a.id, p: at(a.positive), n: at(a.negative), powerW: draw.powerW, draw };
		}),
		loads: doc.loads.map((l) => ({
			id: l.id,
			p: at(l.positive),
			n: at(l.negative),
			currentA: l.currentA,
		})),
		nominalV,
	};
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
	if (-i >= b.chargeAcceptanceA) return [-b.chargeAcceptanceA, 0];
	return [i, -1 / b.chargeResistanceOhm];
}

/** Current out of an alternator: a voltage source at its set point until its limit, never negative. */
export function alternatorCurrent(
	a: CompiledNetwork['alternators'][number],
	v: number,
): [number, number] {
	if (a.limitA <= 0) return [0, 0];
	const i = (a.setPointV - v) / a.resistanceOhm;
	if (i <= 0) return [0, 0];
	if (i >= a.limitA) return [a.limitA, 0];
	return [i, -1 / a.resistanceOhm];
}

interface Assembled {
	f: Float64Array;
	j: Float64Array;
	/** Lowest amplifier terminal voltage seen; non-positive means no physical solution here. */
	minAmpV: number;
}

function assemble(net: CompiledNetwork, v: Float64Array, lambda: number, out: Assembled) {
	const n = net.nodeIds.length;
	const { f, j } = out;
	f.fill(0);
	j.fill(0);
	for (let i = 0; i < n; i++) {
		f[i] = GMIN_S * v[i]!;
		j[i * n + i] = GMIN_S;
	}
	// Adds a two-terminal element drawing `cur` into p (out of n) with incremental conductance `g`.
	const stamp = (p: number, q: number, cur: number, g: number) => {
		if (p >= 0) {
			f[p] += cur;
			j[p * n + p] += g;
		}
		if (q >= 0) {
			f[q] -= cur;
			j[q * n + q] += g;
		}
		if (p >= 0 && q >= 0) {
			j[p * n + q] -= g;
			j[q * n + p] -= g;
		}
	};
	for (const c of net.cables) stamp(c.p, c.n, c.g * (volt(v, c.p) - volt(v, c.n)), c.g);
	for (const b of net.banks) {
		const [i, di] = bankCurrent(b, volt(v, b.p) - volt(v, b.n));
		stamp(b.p, b.n, -i, -di);
	}
	for (const a of net.alternators) {
		const [i, di] = alternatorCurrent(a, volt(v, a.p) - volt(v, a.n));
		stamp(a.p, a.n, -i, -di);
	}
	let minAmpV = Number.POSITIVE_INFINITY;
	for (const a of net.amplifiers) {
		const vpn = volt(v, a.p) - volt(v, a.n);
		minAmpV = Math.min(minAmpV, vpn);
		if (a.powerW === 0) continue;
		const [i, di] = amplifierDrawCurrent(a.draw, vpn, lambda);
		stamp(a.p, a.n, i, di);
	}
	for (const l of net.loads) stamp(l.p, l.n, l.currentA, 0);
	out.minAmpV = minAmpV;
}

/** Cholesky test of the (symmetric) Jacobian: positive definite ⇔ a stable operating point. */
function isPositiveDefinite(a: Float64Array, n: number): boolean {
	const l = new Float64Array(a);
	for (let k = 0; k < n; k++) {
		let d = l[k * n + k]!;
		for (let m = 0; m < k; m++) d -= l[k * n + m]! ** 2;
		if (!(d > 0)) return false;
		const s = Math.sqrt(d);
		l[k * n + k] = s;
		for (let i = k + 1; i < n; i++) {
			let x = l[i * n + k]!;
			for (let m = 0; m < k; m++) x -= l[i * n + m]! * l[k * n + m]!;
			l[i * n + k] = x / s;
		}
	}
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

function newton(
	net: CompiledNetwork,
	lambda: number,
	start: Float64Array,
	work: Assembled,
): NewtonResult {
	const n = net.nodeIds.length;
	let v = new Float64Array(start);
	const trial = new Float64Array(n);
	const floorV = 0.02 * net.nominalV;
	for (let iter = 1; iter <= MAX_ITERATIONS; iter++) {
		assemble(net, v, lambda, work);
		if (lambda > 0 && work.minAmpV < floorV)
			return { ok: false, v, iterations: iter, residualA: Number.NaN };
		const residual = maxAbs(work.f);
		if (residual < RESIDUAL_TOL_A) {
			return { ok: isPositiveDefinite(work.j, n), v, iterations: iter, residualA: residual };
		}
		const step = new Float64Array(n);
		for (let i = 0; i < n; i++) step[i] = -work.f[i]!;
		let slope = 0;
		for (let i = 0; i < n; i++) slope += work.f[i]! * step[i]!; // directional derivative of the co-content
		if (!solveDense(work.j, step, n))
			return { ok: false, v, iterations: iter, residualA: residual };
		slope = 0;
		for (let i = 0; i < n; i++) slope += work.f[i]! * step[i]!;
		if (!(slope < 0)) return { ok: false, v, iterations: iter, residualA: residual };
		const stepSize = maxAbs(step);
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
			while (!(e <= e0 + 1e-4 * t * slope) && t > 1e-14) {
				t /= 2;
				e = at(t);
			}
			if (t <= 1e-14) return { ok: false, v, iterations: iter, residualA: residual };
			for (let k = 0; k < 60; k++) {
				const eHalf = at(t / 2);
				if (!(eHalf < e)) break;
				t /= 2;
				e = eHalf;
			}
		} else if (lambda > 0) {
			for (let i = 0; i < n; i++) trial[i] = v[i]! + step[i]!;
			if (coContent(net, trial, lambda, floorV) === Number.POSITIVE_INFINITY)
				return { ok: false, v, iterations: iter, residualA: residual };
		}
		const next = new Float64Array(n);
		for (let i = 0; i < n; i++) next[i] = v[i]! + t * step[i]!;
		v = next;
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
	const j = new Float64Array(n * n);
	const b = new Float64Array(n);
	for (let i = 0; i < n; i++) j[i * n + i] = GMIN_S;
	const stampG = (p: number, q: number, g: number) => {
		if (p >= 0) j[p * n + p] += g;
		if (q >= 0) j[q * n + q] += g;
		if (p >= 0 && q >= 0) {
			j[p * n + q] -= g;
			j[q * n + p] -= g;
		}
	};
	const inject = (p: number, q: number, amps: number) => {
		if (p >= 0) b[p] += amps;
		if (q >= 0) b[q] -= amps;
	};
	for (const c of net.cables) stampG(c.p, c.n, c.g);
	for (const bank of net.banks) {
		stampG(bank.p, bank.n, 1 / bank.resistanceOhm);
		inject(bank.p, bank.n, bank.ocvV / bank.resistanceOhm);
	}
	for (const a of net.alternators) inject(a.p, a.n, a.limitA);
	const vRef = Math.min(net.nominalV, ...net.banks.map((x) => x.ocvV));
	for (const a of net.amplifiers) stampG(a.p, a.n, (lambda * a.powerW) / (vRef * vRef));
	for (const l of net.loads) inject(l.p, l.n, -l.currentA);
	return solveDense(j, b, n) ? b : null;
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
export function solveCompiled(net: CompiledNetwork, start?: Float64Array): RawSolution {
	const n = net.nodeIds.length;
	const work: Assembled = { f: new Float64Array(n), j: new Float64Array(n * n), minAmpV: 0 };
	let iterations = 0;
	const attempt = (lambda: number, from: Float64Array | null): NewtonResult | null => {
		if (!from) return null;
		const r = newton(net, lambda, from, work);
		iterations += r.iterations;
		return r.ok ? r : null;
	};
	if (start) {
		const warm = attempt(1, start);
		if (warm)
			return { v: warm.v, lambda: 1, collapsed: false, iterations, residualA: warm.residualA };
	}
	const unloaded = newton(net, 0, new Float64Array(n).fill(net.nominalV * 0.5), work);
	iterations += unloaded.iterations;
	if (!unloaded.ok) throw new Error('the unloaded network did not solve; check its topology');
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
		const r = newton(stiffBanks, lambda, guess, work);
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
	const direct = best(1, unloaded.v);
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
