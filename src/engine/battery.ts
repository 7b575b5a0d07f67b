import type { BatteryBank, Chemistry } from './types';

export interface ChemistryProps {
	label: string;
	/** Rested open-circuit voltage per cell against state of charge, ascending SOC. */
	ocvPerCell: ReadonlyArray<readonly [soc: number, volts: number]>;
	/** Charge targets per cell (V). */
	absorptionPerCell: number;
	floatPerCell: number;
	/** Highest charging voltage per cell before damage or gassing (V). */
	maxChargePerCell: number;
	/** Cell voltage treated as empty under load (V). */
	cutoffPerCell: number;
	peukertK: number;
	/** Charge acceptance at low state of charge (C-rate) and the SOC above which it tapers. */
	maxChargeC: number;
	taperFromSoc: number;
	nominalPerCell: number;
}

/**
 * Per-chemistry defaults.
 * - Flooded lead-acid rested OCV, 12 V battery: 100 % 12.6, 75 % 12.4, 50 % 12.2, 25 % 12.0,
 *   0 % 11.8 V (rule of thumb from a secondary source; common practice).
 * - AGM rests about 0.1–0.2 V higher (from memory): flooded + 0.2 V per battery.
 * - Lead-acid charging: absorption 2.40 V/cell, float 2.25 V/cell (battery-education references,
 *   secondary); upper limit 2.45 V/cell and cut-off 1.75 V/cell (10.5 V, the reserve-capacity end
 *   voltage) — common practice.
 * - LiFePO4: rested plateau ≈ 3.3 V/cell, full rested ≈ 3.40 V; charge 3.60 V, limit 3.65 V,
 *   float 3.375 V, cut-off 2.8 V (vendor data, secondary; the curve points are ours).
 * - Peukert exponents: flooded 1.25, AGM 1.1, LiFePO4 1.05 (within the ranges a secondary source
 *   gives). Charge acceptance limits are common practice, no published source.
 */
export const CHEMISTRY_PROPS: Record<Chemistry, ChemistryProps> = {
	flooded: {
		label: 'Flooded lead-acid',
		ocvPerCell: [
			[0, 11.8 / 6],
			[0.25, 12.0 / 6],
			[0.5, 12.2 / 6],
			[0.75, 12.4 / 6],
			[1, 12.6 / 6],
		],
		absorptionPerCell: 2.4,
		floatPerCell: 2.25,
		maxChargePerCell: 2.45,
		cutoffPerCell: 1.75,
		peukertK: 1.25,
		maxChargeC: 0.25,
		taperFromSoc: 0.8,
		nominalPerCell: 2.0,
	},
	agm: {
		label: 'AGM lead-acid',
		ocvPerCell: [
			[0, 12.0 / 6],
			[0.25, 12.2 / 6],
			[0.5, 12.4 / 6],
			[0.75, 12.6 / 6],
			[1, 12.8 / 6],
		],
		absorptionPerCell: 2.4,
		floatPerCell: 2.27,
		maxChargePerCell: 2.45,
		cutoffPerCell: 1.75,
		peukertK: 1.1,
		maxChargeC: 0.4,
		taperFromSoc: 0.8,
		nominalPerCell: 2.0,
	},
	lfp: {
		label: 'LiFePO4',
		ocvPerCell: [
			[0, 2.9],
			[0.1, 3.2],
			[0.2, 3.25],
			[0.5, 3.29],
			[0.8, 3.32],
			[0.9, 3.34],
			[1, 3.4],
		],
		absorptionPerCell: 3.6,
		floatPerCell: 3.375,
		maxChargePerCell: 3.65,
		cutoffPerCell: 2.8,
		peukertK: 1.05,
		maxChargeC: 1,
		taperFromSoc: 0.95,
		nominalPerCell: 3.2,
	},
};

const clamp = (x: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, x));

/** Rested open-circuit voltage per cell at a state of charge (linear between table points). */
export function cellOcv(chemistry: Chemistry, stateOfCharge: number): number {
	const table = CHEMISTRY_PROPS[chemistry].ocvPerCell;
	const soc = clamp(stateOfCharge, 0, 1);
	for (let i = 1; i < table.length; i++) {
		const [s1, v1] = table[i]!;
		const [s0, v0] = table[i - 1]!;
		if (soc <= s1) return v0 + ((v1 - v0) * (soc - s0)) / (s1 - s0);
	}
	return table[table.length - 1]![1];
}

/** Inverse of cellOcv: the state of charge at which the rested cell voltage equals `volts`. */
export function socAtCellOcv(chemistry: Chemistry, volts: number): number {
	const table = CHEMISTRY_PROPS[chemistry].ocvPerCell;
	if (volts <= table[0]![1]) return 0;
	for (let i = 1; i < table.length; i++) {
		const [s1, v1] = table[i]!;
		const [s0, v0] = table[i - 1]!;
		if (volts <= v1) return s0 + ((s1 - s0) * (volts - v0)) / (v1 - v0);
	}
	return 1;
}

export const cellsInSeries = (bank: Pick<BatteryBank, 'cellsPerUnit' | 'unitsInSeries'>) =>
	bank.cellsPerUnit * bank.unitsInSeries;

/** Thevenin equivalent of a bank: V_oc = Ns·V_cell(SOC), R = Ns·R_unit/Np, C = Np·C_unit. */
export function bankThevenin(bank: BatteryBank, stateOfCharge = bank.stateOfCharge) {
	const ocvV = cellsInSeries(bank) * cellOcv(bank.chemistry, stateOfCharge);
	const resistanceOhm = (bank.unitsInSeries * bank.unitResistanceOhm) / bank.stringsInParallel;
	const capacityAh = bank.stringsInParallel * bank.unitCapacityAh;
	return { ocvV, resistanceOhm, capacityAh };
}

export function bankPeukertK(bank: BatteryBank): number {
	return bank.peukertK ?? CHEMISTRY_PROPS[bank.chemistry].peukertK;
}

/** Charge targets and limit for the whole bank (V). Per-unit overrides are scaled by units in series. */
export function bankChargeTargets(bank: BatteryBank) {
	const props = CHEMISTRY_PROPS[bank.chemistry];
	const cells = cellsInSeries(bank);
	return {
		absorptionV:
			bank.absorptionV !== null
				? bank.absorptionV * bank.unitsInSeries
				: props.absorptionPerCell * cells,
		floatV: bank.floatV !== null ? bank.floatV * bank.unitsInSeries : props.floatPerCell * cells,
		maxV: props.maxChargePerCell * cells,
	};
}

/**
 * Largest charging current the bank accepts at a state of charge (A): the chemistry's C-rate,
 * tapering linearly to 2 % of it as the bank approaches full, so a nearly full bank never shows
 * an impossible charging current.
 */
export function chargeAcceptanceA(bank: BatteryBank, stateOfCharge = bank.stateOfCharge): number {
	const props = CHEMISTRY_PROPS[bank.chemistry];
	const c = bank.maxChargeC ?? props.maxChargeC;
	const { capacityAh } = bankThevenin(bank, stateOfCharge);
	const taper = clamp((1 - stateOfCharge) / (1 - props.taperFromSoc), 0.02, 1);
	return c * capacityAh * taper;
}

/**
 * Peukert's law, I^k·t = const, referred to the rated capacity C at the rated time H:
 * t = H · (C / (I·H))^k hours to full discharge at a constant current I.
 */
export function peukertHours(
	capacityAh: number,
	ratedHours: number,
	currentA: number,
	k: number,
): number {
	if (currentA <= 0) return Number.POSITIVE_INFINITY;
	return ratedHours * (capacityAh / (currentA * ratedHours)) ** k;
}

/**
 * Peukert-effective current for coulomb counting: discharging at I removes charge as fast as
 * I_eff = I · (I / I_H)^(k−1), where I_H = C/H is the rated current. Equivalent to Peukert's law.
 */
export function peukertEffectiveCurrentA(
	capacityAh: number,
	ratedHours: number,
	currentA: number,
	k: number,
): number {
	if (currentA <= 0) return currentA;
	const ratedA = capacityAh / ratedHours;
	return currentA * (currentA / ratedA) ** (k - 1);
}
