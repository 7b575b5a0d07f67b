// Solving a compiled network: Newton from the unloaded point or a warm start, the discharge-side
// guess, demand continuation to the collapse point, and the outer rounds for DC-DC chargers.
import { EngineInputError } from './errors';
import { type CompiledNetwork, GMIN_S, type TwoTerminal } from './network';
import { alternatorCurrent, newton, type NewtonResult, volt } from './newton';

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
