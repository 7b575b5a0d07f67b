/** What a report holds: its figures per part and its findings. */
import type { BudgetRow } from './budget';
import type { BurpRun } from './burp';
import type { AmpacityEstimate } from './conductors';
import type { FeedReference } from './feed';
import type { FuseAdvice } from './fuses';
import type { NetworkSolution } from './solve';
import type { TopologyIssue } from './topology';
import type { Scenario } from './types';

export type Severity = 'info' | 'warning' | 'danger';
export type ElementKind =
	'cable' | 'bank' | 'alternator' | 'amplifier' | 'capacitor' | 'charger' | 'build';

export type WarningCode =
	| 'voltage_collapse'
	| 'drop_over_target'
	| 'cable_drop_over_target'
	| 'cmil_below_rule'
	| 'over_capacity'
	| 'unfused_battery_cable'
	| 'fuse_too_far'
	| 'fuse_above_capacity'
	| 'fuse_below_demand'
	| 'cable_too_small'
	| 'charge_voltage_high'
	| 'charge_voltage_low'
	| 'set_point_above_vehicle'
	| 'sustained_deficit'
	| 'bank_not_secured'
	| 'flooded_unvented'
	| 'bank_charge_limited'
	| 'cable_hot_in_burp'
	| 'capacitor_over_rating'
	| 'capacitor_burp_share'
	| 'charger_at_limit';

export interface ReportWarning {
	code: WarningCode;
	severity: Severity;
	element: { kind: ElementKind; id: string };
	message: string;
	/** True when the finding concerns safety: shown with the caution beside it. */
	safety: boolean;
}

export interface CableReport {
	id: string;
	label: string;
	areaMm2: number;
	areaCmil: number;
	resistanceOhm: number;
	sustained: { currentA: number; dropV: number; lossW: number };
	burp: { currentA: number; dropV: number; lossW: number };
	cmilPerAmp: number;
	requiredCmilPerAmp: number;
	ampacity: AmpacityEstimate | null;
	/** Current the fuse must carry: the burp current through the cable (A). */
	designCurrentA: number;
	/** Null on the return (ground) side, where no fuse belongs. */
	fuseAdvice: FuseAdvice | null;
	/** 'supply' carries the positive side; 'return' is ground (both ends near chassis potential). */
	side: 'supply' | 'return';
	leavesBattery: boolean;
	/**
	 * The conductor's temperature at the end of a burp of the scenario's length at the burp current,
	 * from the scenario's conductor temperature, by the adiabatic relation (IEC 60949): an upper
	 * bound, since no heat is let out. `limitC` is the insulation's rating.
	 */
	burpHeating: { finalC: number; riseC: number; limitC: number };
}

export interface AmplifierReport {
	id: string;
	label: string;
	sustainedTerminalV: number;
	burpTerminalV: number;
	/**
	 * Voltage lost under burp between the terminals of the sources that feed this amplifier
	 * (weighted by their shares of its current) and its own: what its feed and return lose (V).
	 */
	burpDropV: number;
	/** The sources the drop is measured from, with their shares (see traceFeeds). */
	burpDropReference: FeedReference;
	burpCurrentA: number;
	/** Output one unit delivers at its burp terminal voltage (W) and the loss against its rating (dB). */
	burpOutputW: number;
	burpOutputLossDb: number;
	/** Lowest terminal voltage during the time-stepped burp (V); null without it. */
	burpRunMinV: number | null;
	/**
	 * Which output model applies: `regulated` holds its rating at any voltage; `unregulated` follows
	 * (V/V_rated)² on both sides of its rated voltage, up to `maxOutputW` when one is stated.
	 */
	outputModel: 'regulated' | 'unregulated';
	maxOutputW: number | null;
}

export interface BankReport {
	id: string;
	label: string;
	ocvV: number;
	resistanceOhm: number;
	capacityAh: number;
	absorptionV: number;
	floatV: number;
	maxChargeV: number;
	sustainedCurrentA: number;
	burpCurrentA: number;
	/** Charge acceptance at its state of charge (A). */
	chargeAcceptanceA: number;
	/** True when, under sustained music, it takes all it accepts: charging is limited by the bank. */
	sustainedChargeLimited: boolean;
}

export interface AlternatorReport {
	id: string;
	label: string;
	limitA: number;
	setPointV: number;
	sustainedCurrentA: number;
	burpCurrentA: number;
	burpMode: 'off' | 'voltage' | 'current';
}

export interface CapacitorReport {
	id: string;
	label: string;
	farads: number;
	esrOhm: number;
	/** The bank's rated voltage: a module's times the modules in series (V). */
	ratedV: number;
	/**
	 * The highest voltage across it at the scenario's steady points: charged at rest before the
	 * burp (with the time-stepped burp), under music and under the burp (V).
	 */
	highestV: number;
	/** The largest current out of it as the burp starts (A); null when the burp had no step. */
	burpPeakA: number | null;
	/** Share of the charge the sources delivered in the burp's first 100 ms that this bank carried (0..1). */
	shareFirst100ms: number | null;
}

/** A DC-DC charger under sustained music (what it does for the auxiliary bank between burps). */
export interface ChargerReport {
	id: string;
	label: string;
	running: boolean;
	limitA: number;
	outputA: number;
	outputV: number;
	inputA: number;
	inputV: number;
	atLimit: boolean;
}

export type BuildReport =
	| { ok: false; issues: TopologyIssue[] }
	| {
			ok: true;
			scenario: Scenario;
			sustained: NetworkSolution;
			burp: NetworkSolution;
			budget: BudgetRow[];
			/** Null when the report was asked for without the time-stepped burp. */
			burpRun: BurpRun | null;
			cables: CableReport[];
			amplifiers: AmplifierReport[];
			banks: BankReport[];
			alternators: AlternatorReport[];
			capacitors: CapacitorReport[];
			chargers: ChargerReport[];
			warnings: ReportWarning[];
	  };
