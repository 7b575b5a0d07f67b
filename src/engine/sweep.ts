import { DEFAULT_SCENARIO } from './report';
import { type NetworkSolution, solveNetwork } from './solve';
import type { BuildDocument, Scenario } from './types';

export interface SpeedPoint {
	engineRpm: number;
	/** No operating point at this speed and demand: the voltages are null. */
	collapse: boolean;
	/** The strongest source's terminal voltage: what the system settles at (V). */
	settleV: number | null;
	lowestAmpV: number | null;
	/** All alternators together (A). */
	alternatorA: number;
	/** All banks together, positive out of them (A): the deficit the banks carry when positive. */
	bankA: number;
}

/** Engine speeds swept by default: from a low idle to a high cruise (rpm). */
export const SWEEP_RPMS = Array.from({ length: 18 }, (_, i) => 600 + i * 200);

function point(engineRpm: number, s: NetworkSolution): SpeedPoint {
	const collapse = s.status === 'collapse';
	return {
		engineRpm,
		collapse,
		settleV: collapse
			? null
			: Math.max(
					0,
					...s.banks.map((b) => b.terminalV),
					...s.alternators.filter((a) => a.mode !== 'off').map((a) => a.terminalV),
				),
		lowestAmpV:
			collapse || s.amplifiers.length === 0
				? null
				: Math.min(...s.amplifiers.map((a) => a.terminalV)),
		alternatorA: s.alternators.reduce((t, a) => t + a.currentA, 0),
		bankA: s.banks.reduce((t, b) => t + b.currentA, 0),
	};
}

/**
 * The system from idle to high engine speed: at each speed the network solved at burp and at music
 * demand (the alternators' curves times their pulley ratios give what each can make there), with
 * the voltage it settles at, the lowest amplifier, the alternators' output and what the banks
 * carry (the deficit when positive).
 */
export function speedSweep(
	doc: BuildDocument,
	scenarioIn: Partial<Scenario> = {},
	rpms: readonly number[] = SWEEP_RPMS,
): { burp: SpeedPoint[]; sustained: SpeedPoint[] } {
	const scenario = { ...DEFAULT_SCENARIO, ...scenarioIn };
	const at = (engineRpm: number, demand: number) =>
		point(
			engineRpm,
			solveNetwork(doc, { engineRpm, demand, conductorTempC: scenario.conductorTempC }),
		);
	return {
		burp: rpms.map((r) => at(r, scenario.burpDemand)),
		sustained: rpms.map((r) => at(r, scenario.sustainedDemand)),
	};
}
