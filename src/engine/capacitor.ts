import type { CapacitorBank } from './types';

/** A capacitor bank's modules combined: n in series, m strings in parallel. */
export interface CapacitorTotals {
	farads: number;
	esrOhm: number;
	ratedV: number;
	/** Leakage as a resistance across the bank (Ω); infinite for none. */
	leakageOhm: number;
}

/**
 * Series and parallel combination (any circuits text, e.g. Hayt & Kemmerly, Engineering Circuit
 * Analysis, ch. 7): capacitances in series add as reciprocals, in parallel add; resistances the
 * other way round; the rated voltage adds along a string. Leakage is taken as a resistance
 * V_rated / I_leak per module.
 */
export function capacitorTotals(c: CapacitorBank): CapacitorTotals {
	const moduleLeakOhm = c.moduleLeakageA > 0 ? c.moduleRatedV / c.moduleLeakageA : Infinity;
	return {
		farads: (c.moduleFarads * c.inParallel) / c.inSeries,
		esrOhm: (c.moduleEsrOhm * c.inSeries) / c.inParallel,
		ratedV: c.moduleRatedV * c.inSeries,
		leakageOhm: (moduleLeakOhm * c.inSeries) / c.inParallel,
	};
}

/** A capacitor bank as the solver holds it: its totals and its state through a time-stepped run. */
export interface CompiledCapacitor {
	id: string;
	farads: number;
	esrOhm: number;
	ratedV: number;
	/** Leakage conductance across the terminals (S). */
	gLeak: number;
	/**
	 * The companion model of one backward-Euler step of length dt (as SPICE integrates): the
	 * capacitor and its series resistance become a conductance 1/(ESR + dt/C) behind the
	 * capacitor's own voltage at the step's start, `vcV`. Zero at a steady operating point, where
	 * a capacitor is open.
	 */
	gStep: number;
	vcV: number;
}

export function compileCapacitor(c: CapacitorBank): CompiledCapacitor {
	const t = capacitorTotals(c);
	return {
		id: c.id,
		farads: t.farads,
		esrOhm: t.esrOhm,
		ratedV: t.ratedV,
		gLeak: Number.isFinite(t.leakageOhm) ? 1 / t.leakageOhm : 0,
		gStep: 0,
		vcV: 0,
	};
}

/**
 * Current into the bank's positive terminal at terminal voltage x, and dI/dx: its leakage, and in
 * a time step the companion branch (x − v_c)/(ESR + dt/C).
 */
export function capacitorCurrent(c: CompiledCapacitor, x: number): [number, number] {
	return [c.gLeak * x + c.gStep * (x - c.vcV), c.gLeak + c.gStep];
}

/** The current through the capacitor itself (not its leakage) at terminal voltage x (A). */
export function capacitorBranchA(c: CompiledCapacitor, x: number): number {
	return c.gStep * (x - c.vcV);
}

/** Prepares every capacitor for a step of dt seconds from its present voltage (null: steady). */
export function beginCapacitorStep(caps: readonly CompiledCapacitor[], dt: number | null) {
	for (const c of caps) c.gStep = dt === null ? 0 : 1 / (c.esrOhm + dt / c.farads);
}

/**
 * Ends a step: each capacitor's voltage moves by its branch current over the step,
 * v_c ← v_c + i·dt/C (backward Euler), where x is its terminal voltage at the step's end.
 */
export function endCapacitorStep(
	caps: readonly CompiledCapacitor[],
	terminalV: (k: number) => number,
	dt: number,
) {
	caps.forEach((c, k) => {
		c.vcV += (capacitorBranchA(c, terminalV(k)) * dt) / c.farads;
	});
}
