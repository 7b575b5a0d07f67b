/**
 * The build document (schema version 1): a vehicle's DC electrical system as a network.
 * SI units throughout: V, A, Ω, m, mm², W, Ah, °C. The zod schema that validates it at every
 * boundary, the engine's input contract, is ./document-schema.ts, checked against these types.
 */

export const AWG_SIZES = ['12', '10', '8', '6', '4', '2', '1', '1/0', '2/0', '3/0', '4/0'] as const;
export type AwgSize = (typeof AWG_SIZES)[number];

export const MATERIALS = ['copper', 'tinned_copper', 'cca10', 'cca15', 'aluminium'] as const;
export type Material = (typeof MATERIALS)[number];

export const CHEMISTRIES = ['flooded', 'agm', 'lfp'] as const;
export type Chemistry = (typeof CHEMISTRIES)[number];

export const NODE_KINDS = [
	'chassis',
	'battery',
	'block',
	'amplifier',
	'alternator',
	'junction',
] as const;
export type NodeKind = (typeof NODE_KINDS)[number];

export interface BuildNode {
	id: string;
	label: string;
	kind: NodeKind;
}

export type CableSize =
	| { kind: 'awg'; awg: AwgSize }
	| { kind: 'mm2'; mm2: number }
	/** A measured metal cross-section, for cable sold under a gauge it does not meet. */
	| { kind: 'measured'; areaMm2: number };

export const PROTECTION_DEVICES = ['fuse', 'breaker'] as const;
export type ProtectionDevice = (typeof PROTECTION_DEVICES)[number];

/** Inline protection on a cable: a fuse in its holder, or a resettable breaker, sized alike. */
export interface Fuse {
	ratingA: number;
	/** Which end of the cable the fuse sits at. */
	end: 'from' | 'to';
	/** Distance from that end's terminal along the cable. */
	distanceM: number;
	/** A fuse (absent means a fuse) or a resettable breaker. */
	device?: ProtectionDevice;
	/**
	 * Resistance of the holder or breaker with its contacts (Ω), in series with the cable: a few
	 * tenths of a milliohm for a good one. Absent means none stated (counted as zero).
	 */
	contactResistanceOhm?: number;
}

export interface Cable {
	id: string;
	label: string;
	from: string;
	to: string;
	size: CableSize;
	material: Material;
	lengthM: number;
	parallelRuns: number;
	/** Fuses on this cable, at most one per end (a run between two banks wants one at each). */
	fuses: Fuse[];
	/** Insulation temperature rating, °C (e.g. 105). */
	insulationC: number;
	/**
	 * Resistance of its terminations and joints beyond the conductor (Ω), for all runs together:
	 * a tired crimp or a loose lug, measured or fitted from a run's log. Absent means none.
	 */
	connectionResistanceOhm?: number;
}

/** Alternator output limit (A) against alternator shaft speed (rpm), hot or cold as stated. */
export interface CurvePoint {
	rpm: number;
	currentA: number;
}

export interface Alternator {
	id: string;
	label: string;
	positive: string;
	negative: string;
	/** Rated hot output at high speed (A). Used when no curve is given. */
	ratedHotA: number;
	/** Output vs alternator shaft speed; empty means a default shape scaled to ratedHotA. */
	curve: CurvePoint[];
	/** True when the curve was measured cold; the engine then derates it by hotFactor. */
	curveIsCold: boolean;
	/** Hot/cold derating applied to a cold curve (common practice 0.8). */
	hotFactor: number;
	/** Crank pulley diameter / alternator pulley diameter. */
	pulleyRatio: number;
	/** Regulator set point (V). */
	setPointV: number;
	/** Regulator stiffness: the source resistance in voltage mode (Ω), small and positive. */
	sourceResistanceOhm: number;
}

export interface BatteryBank {
	id: string;
	label: string;
	positive: string;
	negative: string;
	chemistry: Chemistry;
	/** Cells in one unit (a "12 V" lead-acid battery has 6; a LiFePO4 module 4 or 5). */
	cellsPerUnit: number;
	unitsInSeries: number;
	stringsInParallel: number;
	/** Capacity of one unit at its rated discharge time (Ah). */
	unitCapacityAh: number;
	/** Rated discharge time for the capacity (h), e.g. 20. */
	ratedHours: number;
	/** Internal resistance of one unit (Ω). */
	unitResistanceOhm: number;
	/** State of charge, 0..1. */
	stateOfCharge: number;
	/** Peukert exponent; null uses the chemistry's default. */
	peukertK: number | null;
	/** Absorption and float targets per unit (V); null uses the chemistry's defaults. */
	absorptionV: number | null;
	floatV: number | null;
	/** Largest charging current the bank accepts, in multiples of its capacity (C-rate); null = chemistry default. */
	maxChargeC: number | null;
	location: 'engine_bay' | 'cabin' | 'trunk' | 'exterior';
	secured: boolean;
	vented: boolean;
}

export interface Amplifier {
	id: string;
	label: string;
	positive: string;
	negative: string;
	/** Rated output power (W) at ratedVoltageV. */
	ratedPowerW: number;
	/** Supply voltage the rating was measured at (V), commonly 14.4. */
	ratedVoltageV: number;
	/** Efficiency at rated power, 0 < η ≤ 1. */
	efficiency: number;
	quantity: number;
	/** Regulated supplies hold their output when the voltage sags; most competition amplifiers are not. */
	regulated: boolean;
	/**
	 * Most an unregulated amplifier gives however high the supply (W per unit), e.g. from a bench
	 * measurement; null or absent: its output keeps following (V/V_rated)².
	 */
	maxOutputW?: number | null;
}

export interface SteadyLoad {
	id: string;
	label: string;
	positive: string;
	negative: string;
	currentA: number;
}

export const ISOLATOR_KINDS = ['relay', 'diode'] as const;
export type IsolatorKind = (typeof ISOLATOR_KINDS)[number];

/** When a relay or isolator conducts: with the engine running (on the ignition), always, or never. */
export const ISOLATOR_STATES = ['engine_running', 'always', 'open'] as const;
export type IsolatorState = (typeof ISOLATOR_STATES)[number];

/**
 * A relay (a solenoid's contacts) or a diode isolator between two nodes, commonly between the
 * starting bank and the rear banks. A relay conducts both ways through its closed resistance; a
 * diode isolator only from `from` to `to`, once the voltage across it passes its forward drop.
 */
export interface Isolator {
	id: string;
	label: string;
	from: string;
	to: string;
	kind: IsolatorKind;
	/** When it conducts (for a diode: when it may; it also needs forward voltage). */
	closes: IsolatorState;
	/** Resistance while conducting (Ω): contacts and studs, or the diode's slope resistance. */
	closedResistanceOhm: number;
	/** A diode isolator's forward drop (V); a relay has none (0). */
	forwardDropV: number;
}

/**
 * A bank of capacitor modules (`inSeries` modules per string, `inParallel` strings) beside the
 * amplifiers: it carries the first tens of milliseconds of a burp. At a steady operating point
 * only its leakage flows; through the time-stepped burp and the session it discharges and
 * recharges through its equivalent series resistance.
 */
export interface CapacitorBank {
	id: string;
	label: string;
	positive: string;
	negative: string;
	/** One module's capacitance (F). */
	moduleFarads: number;
	/** One module's equivalent series resistance (Ω). */
	moduleEsrOhm: number;
	/** One module's rated (surge-free working) voltage (V). */
	moduleRatedV: number;
	/** One module's leakage current at its rated voltage (A); 0 for none. */
	moduleLeakageA: number;
	inSeries: number;
	inParallel: number;
}

/**
 * A DC-DC charger between two banks: it draws from the starting system at `from` and charges an
 * auxiliary bank at `to` toward its target voltage, up to its output current limit; input and
 * output both return through the chassis. Its input draws the output power over its efficiency.
 */
export interface DcDcCharger {
	id: string;
	label: string;
	from: string;
	to: string;
	/** Output voltage it regulates toward (V). */
	targetV: number;
	/** Largest output current (A). */
	maxOutputA: number;
	/** Output power over input power, 0 < η ≤ 1. */
	efficiency: number;
	/** When it runs: with the engine running (an ignition trigger), always, or never. */
	runs: IsolatorState;
}

/**
 * The part groups of a build document, listed once: the diff, the merge, the topology check, the
 * document schema and the editor all read this list.
 */
export const PART_GROUPS = [
	'nodes',
	'alternators',
	'banks',
	'amplifiers',
	'loads',
	'cables',
	'isolators',
	'capacitors',
	'chargers',
] as const;
export type PartGroup = (typeof PART_GROUPS)[number];

export interface BuildDocument {
	schemaVersion: 1;
	nodes: BuildNode[];
	alternators: Alternator[];
	banks: BatteryBank[];
	amplifiers: Amplifier[];
	loads: SteadyLoad[];
	cables: Cable[];
	/** Relays and isolators; absent in documents saved before they existed (read as none). */
	isolators?: Isolator[];
	/** Capacitor banks; absent in documents saved before they existed (read as none). */
	capacitors?: CapacitorBank[];
	/** DC-DC chargers; absent in documents saved before they existed (read as none). */
	chargers?: DcDcCharger[];
}

/** What the team asks the engine: operating conditions for a report. */
export interface Scenario {
	/** Engine speed (rpm); 0 = engine off. */
	engineRpm: number;
	/** Fraction of rated power for sustained music (1/8 is the usual figure). */
	sustainedDemand: number;
	/** Fraction of rated power for a burp (1 = full rated power). */
	burpDemand: number;
	/** Supply voltages for the fixed-voltage budget (V). */
	voltagesV: number[];
	/** Conductor temperature for cable resistance (°C). */
	conductorTempC: number;
	/** Largest acceptable drop from source to amplifier terminals (V). */
	dropTargetV: number;
	/** Bank terminal voltage counted as empty while carrying a deficit (V); null = the chemistry's cut-off per cell × cells. */
	cutoffV: number | null;
	/** Burp duration (s) and step (s) for the time-stepped run. */
	burpSeconds: number;
	burpStepS: number;
	/** Distance within which a battery cable's fuse must sit (m); 0.45 m is common practice. */
	fuseDistanceM: number;
}
