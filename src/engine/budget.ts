import { amplifierCurrentA } from './amplifier';
import { alternatorLimitA } from './alternator';
import {
	bankPeukertK,
	bankThevenin,
	CHEMISTRY_PROPS,
	cellsInSeries,
	peukertHours,
	socAtCellOcv,
} from './battery';
import type { BatteryBank, BuildDocument } from './types';

export interface BudgetRow {
	voltageV: number;
	sustainedDemandA: number;
	burpDemandA: number;
	alternatorSupplyA: number;
	/** Supply minus sustained demand (A); negative is a deficit the banks carry. */
	sustainedSurplusA: number;
	burpSurplusA: number;
	/** Hours the banks carry the sustained deficit down to the cut-off; null when there is no deficit. */
	sustainedCarryHours: number | null;
	/** Seconds the banks carry the burp deficit; null when there is no deficit. */
	burpCarrySeconds: number | null;
}

/**
 * Time (h) a bank carries a discharge current I down to its cut-off terminal voltage: the usable
 * fraction is the state of charge above the point where V_oc(SOC) − I·R reaches the cut-off, and
 * the time for it follows Peukert's law, t = f · H · (C/(I·H))^k.
 */
export function bankCarryHours(
	bank: BatteryBank,
	currentA: number,
	cutoffV: number | null,
): number {
	if (currentA <= 0) return Number.POSITIVE_INFINITY;
	const { resistanceOhm, capacityAh } = bankThevenin(bank);
	const cells = cellsInSeries(bank);
	const cutoff = cutoffV ?? CHEMISTRY_PROPS[bank.chemistry].cutoffPerCell * cells;
	const emptySoc = socAtCellOcv(bank.chemistry, (cutoff + currentA * resistanceOhm) / cells);
	const usable = Math.max(0, bank.stateOfCharge - emptySoc);
	return usable * peukertHours(capacityAh, bank.ratedHours, currentA, bankPeukertK(bank));
}

/**
 * Time all banks together carry a deficit: the deficit is shared in proportion to each bank's
 * conductance (1/R, as parallel Thevenin sources share a load), and the system is empty when the
 * first bank reaches its cut-off.
 */
export function banksCarryHours(
	banks: BatteryBank[],
	deficitA: number,
	cutoffV: number | null,
): number | null {
	if (deficitA <= 0) return null;
	if (banks.length === 0) return 0;
	const g = banks.map((b) => 1 / bankThevenin(b).resistanceOhm);
	const total = g.reduce((s, x) => s + x, 0);
	return Math.min(...banks.map((b, i) => bankCarryHours(b, (deficitA * g[i]!) / total, cutoffV)));
}

/**
 * The simple budget at fixed supply voltages: amplifier current I = d·P·n/(η·V) at sustained and
 * burp demand plus steady loads, against the alternators' output limit at the engine speed.
 */
export function fixedVoltageBudget(
	doc: BuildDocument,
	opts: {
		voltagesV: number[];
		engineRpm: number;
		sustainedDemand: number;
		burpDemand: number;
		cutoffV: number | null;
	},
): BudgetRow[] {
	const steadyA = doc.loads.reduce((s, l) => s + l.currentA, 0);
	const alternatorSupplyA = doc.alternators.reduce(
		(s, a) => s + alternatorLimitA(a, opts.engineRpm),
		0,
	);
	return opts.voltagesV.map((voltageV) => {
		const ampsAt = (d: number) =>
			doc.amplifiers.reduce((s, a) => s + amplifierCurrentA(a, d, voltageV), 0);
		const sustainedDemandA = ampsAt(opts.sustainedDemand) + steadyA;
		const burpDemandA = ampsAt(opts.burpDemand) + steadyA;
		const sustainedSurplusA = alternatorSupplyA - sustainedDemandA;
		const burpSurplusA = alternatorSupplyA - burpDemandA;
		const sustainedCarryHours = banksCarryHours(doc.banks, -sustainedSurplusA, opts.cutoffV);
		const burpHours = banksCarryHours(doc.banks, -burpSurplusA, opts.cutoffV);
		return {
			voltageV,
			sustainedDemandA,
			burpDemandA,
			alternatorSupplyA,
			sustainedSurplusA,
			burpSurplusA,
			sustainedCarryHours,
			burpCarrySeconds: burpHours === null ? null : burpHours * 3600,
		};
	});
}
