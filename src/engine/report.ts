import { availableOutputW, outputLossDb } from './amplifier';
import { alternatorLimitA } from './alternator';
import { bankChargeTargets, bankThevenin } from './battery';
import { fixedVoltageBudget } from './budget';
import { runBurp } from './burp';
import { capacitorTotals } from './capacitor';
import { partsOf } from './part-kinds';
import {
	ampacityEstimate,
	cableAreaMm2,
	cmilPerAmp,
	mm2ToCmil,
	requiredCmilPerAmp,
} from './conductors';
import { evaluateFindings } from './evaluate-findings';
import { batteryEnds, type FindingContext } from './finding-rules';
import { adviseFuse } from './fuses';
import { adiabaticFinalC } from './heating';
import { traceFeeds } from './feed';
import { solveNetwork } from './solve';
import { checkTopology } from './topology';
import type { BuildDocument, Scenario } from './types';
import type { UnitSystem } from './units';
import type {
	AlternatorReport,
	AmplifierReport,
	BankReport,
	CapacitorReport,
	ChargerReport,
	BuildReport,
	CableReport,
} from './report-types';

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

export * from './report-types';
export { VEHICLE_SET_POINT_LIMIT_V } from './finding-rules';

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

	const bankPositives = new Set(doc.banks.map((b) => b.positive));
	const nodeLabels = new Map(doc.nodes.map((n) => [n.id, n.label]));
	const ctx: FindingContext = {
		doc,
		scenario,
		units,
		sustained,
		burp,
		bankPositives,
		nodeLabel: (id) => nodeLabels.get(id) ?? id,
	};
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
		const finalC = adiabaticFinalC(
			cable.material,
			cableAreaMm2(cable.size) * cable.parallelRuns,
			Math.abs(bc.currentA),
			scenario.burpSeconds,
			scenario.conductorTempC,
		);
		return {
			id: cable.id,
			label: cable.label,
			areaMm2: cableAreaMm2(cable.size) * cable.parallelRuns,
			areaCmil: mm2ToCmil(cableAreaMm2(cable.size)) * cable.parallelRuns,
			resistanceOhm: sc.resistanceOhm,
			sustained: { currentA: sc.currentA, dropV: sc.dropV, lossW: sc.lossW },
			burp: { currentA: bc.currentA, dropV: bc.dropV, lossW: bc.lossW },
			cmilPerAmp: cmilPerAmp(cable.size, cable.parallelRuns, designCurrentA),
			requiredCmilPerAmp: requiredCmilPerAmp(cable.material),
			ampacity,
			designCurrentA,
			fuseAdvice: side === 'supply' ? adviseFuse(designCurrentA, ampacity?.currentA ?? null) : null,
			side,
			leavesBattery: batteryEnds(cable, ctx).length > 0,
			burpHeating: { finalC, riseC: finalC - scenario.conductorTempC, limitC: cable.insulationC },
		};
	});

	const feeds = traceFeeds(doc, burp);
	const amplifiers: AmplifierReport[] = doc.amplifiers.map((amp, i) => {
		const b = burp.amplifiers[i]!;
		const feed = feeds.get(amp.id)!;
		return {
			id: amp.id,
			label: amp.label,
			sustainedTerminalV: sustained.amplifiers[i]!.terminalV,
			burpTerminalV: b.terminalV,
			burpDropV: feed.referenceV - b.terminalV,
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
		const charging = sustained.banks[i]!;
		return {
			id: bank.id,
			label: bank.label,
			ocvV: th.ocvV,
			resistanceOhm: th.resistanceOhm,
			capacityAh: th.capacityAh,
			absorptionV: targets.absorptionV,
			floatV: targets.floatV,
			maxChargeV: targets.maxV,
			sustainedCurrentA: charging.currentA,
			burpCurrentA: burp.banks[i]!.currentA,
			chargeAcceptanceA: charging.chargeAcceptanceA,
			sustainedChargeLimited: sustained.status === 'ok' && charging.chargeLimited,
		};
	});

	const alternators: AlternatorReport[] = doc.alternators.map((alt, i) => ({
		id: alt.id,
		label: alt.label,
		limitA: alternatorLimitA(alt, scenario.engineRpm),
		setPointV: alt.setPointV,
		sustainedCurrentA: sustained.alternators[i]!.currentA,
		burpCurrentA: burp.alternators[i]!.currentA,
		burpMode: burp.alternators[i]!.mode,
	}));

	// The capacitor banks' part of the burp's start comes from the time-stepped burp; when the report
	// leaves that out (the editor's live figures), from its first 100 ms alone, the same steps, so
	// every view of a build shows the same figures and findings.
	const capRun =
		partsOf(doc, 'capacitors').length === 0
			? null
			: (burpRun ??
				runBurp(doc, {
					...base,
					demand: scenario.burpDemand,
					durationS: Math.min(0.1, scenario.burpSeconds),
					stepS: scenario.burpStepS,
				}));
	const capacitors: CapacitorReport[] = partsOf(doc, 'capacitors').map((cap, i) => {
		const totals = capacitorTotals(cap);
		const run = capRun?.capacitors[cap.id];
		return {
			id: cap.id,
			label: cap.label,
			farads: totals.farads,
			esrOhm: totals.esrOhm,
			ratedV: totals.ratedV,
			highestV: Math.max(
				run?.startV ?? 0,
				sustained.capacitors[i]!.terminalV,
				burp.capacitors[i]!.terminalV,
			),
			burpPeakA: run?.peakA ?? null,
			shareFirst100ms: run?.shareFirst100ms ?? null,
		};
	});

	const chargers: ChargerReport[] = partsOf(doc, 'chargers').map((part, i) => {
		const r = sustained.chargers[i]!;
		return {
			id: part.id,
			label: part.label,
			running: r.running,
			limitA: part.maxOutputA,
			outputA: r.outputA,
			outputV: r.outputV,
			inputA: r.inputA,
			inputV: r.inputV,
			atLimit: sustained.status === 'ok' && r.atLimit,
		};
	});

	const warnings = evaluateFindings(ctx, {
		charger: partsOf(doc, 'chargers').map((part, i) => ({
			id: part.id,
			subject: { part, figures: chargers[i]! },
		})),
		capacitor: partsOf(doc, 'capacitors').map((part, i) => ({
			id: part.id,
			subject: { part, figures: capacitors[i]! },
		})),
		build: [{ id: 'build', subject: { part: doc, figures: null } }],
		cable: doc.cables.map((part, i) => ({ id: part.id, subject: { part, figures: cables[i]! } })),
		amplifier: doc.amplifiers.map((part, i) => ({
			id: part.id,
			subject: { part, figures: amplifiers[i]! },
		})),
		bank: doc.banks.map((part, i) => ({ id: part.id, subject: { part, figures: banks[i]! } })),
		alternator: doc.alternators.map((part, i) => ({
			id: part.id,
			subject: { part, figures: alternators[i]! },
		})),
	});

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
		capacitors,
		chargers,
		warnings,
	};
}
