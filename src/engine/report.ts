import { availableOutputW, outputLossDb } from './amplifier';
import { alternatorLimitA } from './alternator';
import { bankChargeTargets, bankThevenin, CHEMISTRY_PROPS } from './battery';
import { type BudgetRow, fixedVoltageBudget } from './budget';
import { type BurpRun, runBurp } from './burp';
import {
	type AmpacityEstimate,
	ampacityEstimate,
	cableAreaMm2,
	cmilPerAmp,
	mm2ToCmil,
	requiredCmilPerAmp,
} from './conductors';
import { adviseFuse, type FuseAdvice, MAX_FUSE_FACTOR } from './fuses';
import { adiabaticFinalC } from './heating';
import { describeFeed, type FeedReference, traceFeeds } from './feed';
import { type NetworkSolution, solveNetwork } from './solve';
import { checkTopology, type TopologyIssue } from './topology';
import type { BuildDocument, Scenario } from './types';
import { formatShortDistance, type UnitSystem } from './units';

export const DEFAULT_VOLTAGES_V = [12.0, 12.6, 13.8, 14.4, 16.0];

/** Defaults a team can change per report. */
export const DEFAULT_SCENARIO: Scenario = {
	engineRpm: 1500,
	sustainedDemand: 1 / 8,
	burpDemand: 1,
	voltagesV: DEFAULT_VOLTAGES_V,
	conductorTempC: 25,
	dropTargetV: 0.5, // common practice, no published source
	cutoffV: null,
	burpSeconds: 10,
	burpStepS: 0.01,
	fuseDistanceM: 0.45, // 18 in: common practice, no published source
};

export type Severity = 'info' | 'warning' | 'danger';
export type ElementKind = 'cable' | 'bank' | 'alternator' | 'amplifier' | 'build';

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
	| 'cable_hot_in_burp';

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
			warnings: ReportWarning[];
	  };

/** Set point above which a stock vehicle's electronics are at risk: common practice, no published source. */
export const VEHICLE_SET_POINT_LIMIT_V = 15.0;

const fmt = (x: number, digits = 2) => x.toFixed(digits);

/**
 * Everything the team needs to know about one build under one scenario: the network solved at
 * sustained and burp demand, the fixed-voltage budget, a time-stepped burp, per-cable sizing and
 * fuse advice, per-amplifier terminal voltages and output, and warnings with code, severity and
 * the element they concern. Deterministic; no I/O.
 */
export function buildReport(
	doc: BuildDocument,
	scenarioIn: Partial<Scenario> = {},
	opts: { burpRun?: boolean; units?: UnitSystem } = {},
): BuildReport {
	const scenario: Scenario = { ...DEFAULT_SCENARIO, ...scenarioIn };
	const units = opts.units ?? 'metric';
	const issues = checkTopology(doc);
	if (issues.length > 0) return { ok: false, issues };

	const base = { engineRpm: scenario.engineRpm, conductorTempC: scenario.conductorTempC };
	const sustained = solveNetwork(doc, { ...base, demand: scenario.sustainedDemand });
	const burp = solveNetwork(doc, { ...base, demand: scenario.burpDemand });
	const budget = fixedVoltageBudget(doc, { ...scenario });
	// The time-stepped burp is the costly part; an editor recomputing on every keystroke may leave it out.
	const burpRun =
		opts.burpRun === false
			? null
			: runBurp(doc, {
					...base,
					demand: scenario.burpDemand,
					durationS: scenario.burpSeconds,
					stepS: scenario.burpStepS,
				});
	const warnings: ReportWarning[] = [];
	const warn = (w: ReportWarning) => warnings.push(w);

	for (const [name, s] of [
		['sustained music', sustained],
		['burp', burp],
	] as const) {
		if (s.status === 'collapse') {
			warn({
				code: 'voltage_collapse',
				severity: 'danger',
				element: { kind: 'build', id: 'build' },
				safety: false,
				message: `At ${name} demand the system has no operating point: the sources can carry only ${fmt(s.solvedDemandFraction * 100, 0)} % of it before the voltage collapses.`,
			});
		}
	}

	const bankPositives = new Set(doc.banks.map((b) => b.positive));
	const nominalV = Math.max(
		1,
		...doc.banks.map((b) => bankThevenin(b).ocvV),
		...doc.alternators.map((a) => a.setPointV),
	);
	const cables: CableReport[] = doc.cables.map((cable, i) => {
		const sc = sustained.cables[i]!;
		const bc = burp.cables[i]!;
		// A fuse must pass the burp and 1.25 × the sustained current (common practice, no published source).
		const designCurrentA = Math.max(Math.abs(bc.currentA), 1.25 * Math.abs(sc.currentA));
		const ampacity = ampacityEstimate(cable);
		const side =
			Math.max(Math.abs(burp.nodeVoltages[cable.from]!), Math.abs(burp.nodeVoltages[cable.to]!)) <
			0.5 * nominalV
				? 'return'
				: 'supply';
		const fuseAdvice =
			side === 'supply' ? adviseFuse(designCurrentA, ampacity?.currentA ?? null) : null;
		const offered = cmilPerAmp(cable.size, cable.parallelRuns, designCurrentA);
		const required = requiredCmilPerAmp(cable.material);
		const batteryEnds = (['from', 'to'] as const).filter((end) => bankPositives.has(cable[end]));
		const el = { kind: 'cable' as const, id: cable.id };

		if (Math.abs(bc.dropV) > scenario.dropTargetV) {
			warn({
				code: 'cable_drop_over_target',
				severity: 'warning',
				element: el,
				safety: false,
				message: `"${cable.label}" drops ${fmt(Math.abs(bc.dropV))} V under burp, over the ${fmt(scenario.dropTargetV)} V target.`,
			});
		}
		if (offered < required) {
			warn({
				code: 'cmil_below_rule',
				severity: 'warning',
				element: el,
				safety: false,
				message: `"${cable.label}" offers ${fmt(offered, 0)} cmil/A at ${fmt(designCurrentA, 0)} A; the rule of thumb for this material is ${fmt(required, 0)} cmil/A.`,
			});
		}
		if (ampacity && Math.abs(sc.currentA) > ampacity.currentA) {
			warn({
				code: 'over_capacity',
				severity: 'danger',
				element: el,
				safety: true,
				message: `"${cable.label}" carries ${fmt(Math.abs(sc.currentA), 0)} A sustained, above the ${fmt(ampacity.currentA, 0)} A it can carry continuously: it will overheat.`,
			});
		}
		for (const end of batteryEnds) {
			const fuse = cable.fuses.find((f) => f.end === end);
			const nodeLabel = doc.nodes.find((n) => n.id === cable[end])?.label ?? cable[end];
			if (!fuse) {
				warn({
					code: 'unfused_battery_cable',
					severity: 'danger',
					element: el,
					safety: true,
					message: `"${cable.label}" leaves the battery positive at "${nodeLabel}" with no fuse at that end.`,
				});
			} else if (fuse.distanceM > scenario.fuseDistanceM) {
				warn({
					code: 'fuse_too_far',
					severity: 'danger',
					element: el,
					safety: true,
					message: `The fuse on "${cable.label}" sits ${formatShortDistance(fuse.distanceM, units)} from the battery at "${nodeLabel}"; keep it within ${formatShortDistance(scenario.fuseDistanceM, units)}.`,
				});
			}
		}
		for (const fuse of cable.fuses) {
			if (ampacity && fuse.ratingA > ampacity.currentA * MAX_FUSE_FACTOR) {
				warn({
					code: 'fuse_above_capacity',
					severity: 'danger',
					element: el,
					safety: true,
					message: `The ${fmt(fuse.ratingA, 0)} A fuse on "${cable.label}" is above the ${fmt(ampacity.currentA * MAX_FUSE_FACTOR, 0)} A the cable may be protected with: it would not blow before the cable overheats.`,
				});
			}
			if (fuse.ratingA < designCurrentA) {
				warn({
					code: 'fuse_below_demand',
					severity: 'warning',
					element: el,
					safety: false,
					message: `The ${fmt(fuse.ratingA, 0)} A fuse on "${cable.label}" is below the ${fmt(designCurrentA, 0)} A it carries under burp.`,
				});
			}
		}
		const finalC = adiabaticFinalC(
			cable.material,
			cableAreaMm2(cable.size) * cable.parallelRuns,
			Math.abs(bc.currentA),
			scenario.burpSeconds,
			scenario.conductorTempC,
		);
		if (finalC > cable.insulationC) {
			warn({
				code: 'cable_hot_in_burp',
				severity: 'danger',
				element: el,
				safety: true,
				message: `"${cable.label}" would heat from ${fmt(scenario.conductorTempC, 0)} °C to ${finalC > 999 ? 'over 999' : fmt(finalC, 0)} °C over a ${fmt(scenario.burpSeconds, 0)} s burp at ${fmt(Math.abs(bc.currentA), 0)} A, past its ${fmt(cable.insulationC, 0)} °C insulation (adiabatic estimate, IEC 60949).`,
			});
		}
		if (fuseAdvice?.status === 'cable_too_small') {
			warn({
				code: 'cable_too_small',
				severity: 'danger',
				element: el,
				safety: true,
				message: `"${cable.label}": ${fuseAdvice.message}`,
			});
		}
		return {
			id: cable.id,
			label: cable.label,
			areaMm2: cableAreaMm2(cable.size) * cable.parallelRuns,
			areaCmil: mm2ToCmil(cableAreaMm2(cable.size)) * cable.parallelRuns,
			resistanceOhm: sc.resistanceOhm,
			sustained: { currentA: sc.currentA, dropV: sc.dropV, lossW: sc.lossW },
			burp: { currentA: bc.currentA, dropV: bc.dropV, lossW: bc.lossW },
			cmilPerAmp: offered,
			requiredCmilPerAmp: required,
			ampacity,
			designCurrentA,
			fuseAdvice,
			side,
			leavesBattery: batteryEnds.length > 0,
			burpHeating: {
				finalC,
				riseC: finalC - scenario.conductorTempC,
				limitC: cable.insulationC,
			},
		};
	});

	const feeds = traceFeeds(doc, burp);
	const amplifiers: AmplifierReport[] = doc.amplifiers.map((amp, i) => {
		const b = burp.amplifiers[i]!;
		const feed = feeds.get(amp.id)!;
		const dropV = feed.referenceV - b.terminalV;
		if (dropV > scenario.dropTargetV) {
			warn({
				code: 'drop_over_target',
				severity: 'warning',
				element: { kind: 'amplifier', id: amp.id },
				safety: false,
				message: `"${amp.label}" sees ${fmt(dropV)} V less under burp than the terminals of ${describeFeed(feed)}, lost in its feed and return (target ${fmt(scenario.dropTargetV)} V): ${fmt(-outputLossDb(amp, b.terminalV))} dB below its rating.`,
			});
		}
		return {
			id: amp.id,
			label: amp.label,
			sustainedTerminalV: sustained.amplifiers[i]!.terminalV,
			burpTerminalV: b.terminalV,
			burpDropV: dropV,
			burpDropReference: feed,
			burpCurrentA: b.currentA,
			burpOutputW: availableOutputW(amp, b.terminalV),
			burpOutputLossDb: outputLossDb(amp, b.terminalV),
			burpRunMinV: burpRun ? burpRun.amplifierMinV[amp.id]! : null,
			outputModel: amp.regulated ? 'regulated' : 'unregulated',
			maxOutputW: amp.regulated ? null : (amp.maxOutputW ?? null),
		};
	});

	const banks: BankReport[] = doc.banks.map((bank, i) => {
		const th = bankThevenin(bank);
		const targets = bankChargeTargets(bank);
		const el = { kind: 'bank' as const, id: bank.id };
		for (const alt of doc.alternators) {
			if (alt.setPointV > targets.maxV) {
				warn({
					code: 'charge_voltage_high',
					severity: 'danger',
					element: el,
					safety: true,
					message: `Regulator "${alt.label}" is set to ${fmt(alt.setPointV)} V, above the ${fmt(targets.maxV)} V limit of "${bank.label}" (${CHEMISTRY_PROPS[bank.chemistry].label}): it will be overcharged.`,
				});
			} else if (alt.setPointV < targets.floatV) {
				warn({
					code: 'charge_voltage_low',
					severity: 'warning',
					element: el,
					safety: false,
					message: `Regulator "${alt.label}" is set to ${fmt(alt.setPointV)} V, below the ${fmt(targets.floatV)} V float voltage of "${bank.label}": it will never fill.`,
				});
			}
		}
		if (!bank.secured) {
			warn({
				code: 'bank_not_secured',
				severity: 'danger',
				element: el,
				safety: true,
				message: `"${bank.label}" is not marked as secured.`,
			});
		}
		if (bank.chemistry === 'flooded' && bank.location === 'cabin' && !bank.vented) {
			warn({
				code: 'flooded_unvented',
				severity: 'danger',
				element: el,
				safety: true,
				message: `"${bank.label}" is flooded lead-acid inside the cabin without venting: charging gives off hydrogen.`,
			});
		}
		const charging = sustained.banks[i]!;
		if (sustained.status === 'ok' && charging.chargeLimited) {
			warn({
				code: 'bank_charge_limited',
				severity: 'info',
				element: el,
				safety: false,
				message: `"${bank.label}" takes ${fmt(charging.chargeAcceptanceA, 0)} A under sustained music, all it accepts at this state of charge: it charges as fast as it can, and more alternator current would not fill it sooner.`,
			});
		}
		return {
			id: bank.id,
			label: bank.label,
			ocvV: th.ocvV,
			resistanceOhm: th.resistanceOhm,
			capacityAh: th.capacityAh,
			absorptionV: targets.absorptionV,
			floatV: targets.floatV,
			maxChargeV: targets.maxV,
			sustainedCurrentA: sustained.banks[i]!.currentA,
			burpCurrentA: burp.banks[i]!.currentA,
			chargeAcceptanceA: charging.chargeAcceptanceA,
			sustainedChargeLimited: sustained.status === 'ok' && charging.chargeLimited,
		};
	});

	for (const alt of doc.alternators) {
		if (alt.setPointV > VEHICLE_SET_POINT_LIMIT_V) {
			warn({
				code: 'set_point_above_vehicle',
				severity: 'warning',
				element: { kind: 'alternator', id: alt.id },
				safety: true,
				message: `Regulator "${alt.label}" is set to ${fmt(alt.setPointV)} V: above about ${fmt(VEHICLE_SET_POINT_LIMIT_V, 1)} V the vehicle's own electronics may be damaged. Check what the vehicle was designed for.`,
			});
		}
	}

	const sustainedBankDraw = sustained.banks.reduce((s, b) => s + b.currentA, 0);
	if (sustained.status === 'ok' && sustainedBankDraw > 0.5) {
		warn({
			code: 'sustained_deficit',
			severity: 'warning',
			element: { kind: 'build', id: 'build' },
			safety: false,
			message: `At ${scenario.engineRpm} rpm and sustained music the banks supply ${fmt(sustainedBankDraw, 0)} A: the alternators cannot keep up, so the banks run down.`,
		});
	}

	const alternators: AlternatorReport[] = doc.alternators.map((alt, i) => ({
		id: alt.id,
		label: alt.label,
		limitA: alternatorLimitA(alt, scenario.engineRpm),
		setPointV: alt.setPointV,
		sustainedCurrentA: sustained.alternators[i]!.currentA,
		burpCurrentA: burp.alternators[i]!.currentA,
		burpMode: burp.alternators[i]!.mode,
	}));

	return {
		ok: true,
		scenario,
		sustained,
		burp,
		budget,
		burpRun,
		cables,
		amplifiers,
		banks,
		alternators,
		warnings,
	};
}
