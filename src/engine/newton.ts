// The Newton iteration on a compiled network: assembly of the nodal residual and Jacobian, the
// co-content the line search descends, and the damped, voltage-limited step.
import { amplifierDrawCoContent, amplifierDrawCurrent } from './amplifier';
import { capacitorCurrent } from './capacitor';
import { type CompiledNetwork, GMIN_S, type TwoTerminal } from './network';
import type { FactorResult } from './sparse';

/**
 * A node's voltage by index (the chassis, index −1, is 0 V). The element laws live here with the
 * assembly that calls them thousands of times a burp: a call across modules costs more where the
 * code runs unbundled.
 */
export const volt = (v: Float64Array, i: number) => (i < 0 ? 0 : v[i]!);

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

/** A node's voltage by index (the chassis, index −1, is 0 V). */
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
export function bankMode(b: CompiledNetwork['banks'][number], x: number): number {
	if (x <= b.ocvV) return 0;
	return -(b.ocvV - x) / b.chargeResistanceOhm > b.chargeAcceptanceA ? 2 : 1;
}

export function alternatorMode(a: CompiledNetwork['alternators'][number], x: number): number {
	if (a.limitA <= 0) return 0;
	const i = (a.setPointV - x) / a.resistanceOhm;
	return i < 0 ? 0 : i > a.limitA ? 2 : 1;
}

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
	// Indexed loops over the kinds most builds have none of: an empty for-of still makes an
	// iterator, thousands of times a burp.
	for (let k = 0; k < net.capacitors.length; k++) {
		const c = net.capacitors[k]!;
		const [i, di] = capacitorCurrent(c, volt(v, c.p) - volt(v, c.n));
		stamp(f, j, c, i, di);
	}
	for (let k = 0; k < net.chargers.length; k++) {
		const { output, input } = net.chargers[k]!;
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
	for (let k = 0; k < net.isolators.length; k++) {
		const x = net.isolators[k]!;
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
	for (let k = 0; k < net.capacitors.length; k++) {
		const c = net.capacitors[k]!;
		const x = volt(v, c.p) - volt(v, c.n);
		e += 0.5 * c.gLeak * x * x + 0.5 * c.gStep * (x - c.vcV) ** 2;
	}
	for (let k = 0; k < net.chargers.length; k++) {
		const { output: a, input } = net.chargers[k]!;
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
	for (let k = 0; k < net.isolators.length; k++) {
		const x = net.isolators[k]!;
		const over = volt(v, x.p) - volt(v, x.n) - x.dropV;
		if (!x.diode || over > 0) e += 0.5 * x.g * over * over;
	}
	return e;
}

export interface NewtonResult {
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
export function newton(
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
