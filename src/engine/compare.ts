import { outputLossDb } from './amplifier';
import { banksCarryHours } from './budget';
import { bankThevenin } from './battery';
import { runBurp } from './burp';
import { engineOffPlayTime, runSession } from './session';
import { addedFindings, findingCounts, findingKey } from './findings';
import { buildReport, DEFAULT_SCENARIO, type ReportWarning, type Severity } from './report';
import { type NetworkSolution, solveNetwork } from './solve';
import { speedSweep } from './sweep';
import type { BuildDocument, Scenario } from './types';

export interface PlanCandidate {
	id: string;
	name: string;
	document: BuildDocument;
	/** Total cost of the parts list, in the team's currency. */
	cost: number;
}

export interface ComparisonColumn {
	id: string;
	name: string;
	/** The lowest amplifier terminal voltage at burp and at sustained demand (V); null at a collapse. */
	lowestAmplifierV: { burp: number | null; sustained: number | null };
	/** Output at the weakest amplifier relative to the current build under burp (dB; + is louder). */
	deltaDb: number | null;
	/** Hours the banks carry the sustained deficit at the scenario's engine speed (null: no deficit). */
	carryHours: number | null;
	/** The voltage the system settles at (strongest source terminals) under burp and sustained demand. */
	busV: { burp: number | null; sustained: number | null };
	/**
	 * Each amplifier's terminal voltage under burp and sustained demand, and the lowest it reaches
	 * during the scenario's time-stepped burp as the banks discharge (null after a collapse).
	 */
	amplifiers: {
		id: string;
		label: string;
		burpV: number;
		sustainedV: number;
		burpRunMinV: number | null;
	}[];
	/** The fixed-voltage budget: surplus and burp carry time at each supply voltage. */
	budget: {
		voltageV: number;
		sustainedSurplusA: number;
		burpSurplusA: number;
		burpCarrySeconds: number | null;
	}[];
	warnings: number;
	/** Findings by severity: the same counts as the build page's summary strip. */
	findings: Record<Severity, number>;
	/**
	 * Danger findings this column has that the current build does not (the messages): a plan that
	 * brings one is named for it, never marked best value, and asks before it is installed.
	 */
	addedDangers: { key: string; message: string }[];
	/** Findings raised against cables (drop, cmil per amp, capacity, fusing). */
	cableWarnings: string[];
	/**
	 * Findings raised against amplifiers (drop along the feed, output), each with how that
	 * amplifier's own burp voltage moved against the current build (V; + is higher, null in the
	 * current build's column or where the amplifier is new or a side collapsed): a plan can raise
	 * every amplifier's voltage and still leave a drop finding standing.
	 */
	amplifierFindings: { amplifierId: string; message: string; changeV: number | null }[];
	safetyFindings: number;
	cost: number;
	/** The cable that runs hottest in the burp (adiabatic, IEC 60949) against its insulation. */
	hottestCable: { label: string; finalC: number; limitC: number } | null;
	/** The lowest swept engine speed at which the alternators carry the music alone (null: none). */
	carriesMusicFromRpm: number | null;
	/**
	 * The default session of burps (state of charge carried, recharged in the rests): the lowest
	 * amplifier voltage in the first and the last burp, the charge left in all banks at the end
	 * (Ah and the lowest bank's %), and where it collapsed (s) if it did.
	 */
	session: {
		burps: number;
		firstBurpV: number | null;
		lastBurpV: number | null;
		chargeLeftAh: number;
		lowestSocPct: number;
		collapsedAtS: number | null;
	} | null;
	/** Engine off at the music level: seconds until a bank's cut-off (null: more than six hours). */
	engineOffPlayS: number | null;
	/** dB gained per unit of money (null when free or not louder). */
	dbPerMoney: number | null;
}

/** The strongest source's terminal voltage: what the system settles at. Null at a collapse. */
function settled(s: NetworkSolution): number | null {
	if (s.status === 'collapse') return null;
	return Math.max(
		0,
		...s.banks.map((b) => b.terminalV),
		...s.alternators.filter((a) => a.mode !== 'off').map((a) => a.terminalV),
	);
}

/** The lowest amplifier terminal voltage of a solution (null at a collapse or with no amplifier). */
function lowestOf(s: NetworkSolution): number | null {
	if (s.status === 'collapse' || s.amplifiers.length === 0) return null;
	return Math.min(...s.amplifiers.map((a) => a.terminalV));
}

function lowest(doc: BuildDocument, scenario: Scenario, demand: number): number | null {
	return lowestOf(
		solveNetwork(doc, {
			engineRpm: scenario.engineRpm,
			demand,
			conductorTempC: scenario.conductorTempC,
		}),
	);
}

/**
 * The current build and each plan side by side: the lowest amplifier voltage at burp and at
 * sustained demand, the weakest amplifier's output relative to the current build (an unregulated
 * amplifier follows V², so ΔL = 20·log10(V_plan/V_now) while below its rated voltage), how long the
 * banks carry the music deficit, warnings, cost and dB per unit of money. Every figure is the same
 * engine run the build page shows for that document.
 */
export function comparePlans(
	current: BuildDocument,
	plans: PlanCandidate[],
	scenarioIn: Partial<Scenario> = {},
): ComparisonColumn[] {
	const scenario: Scenario = { ...DEFAULT_SCENARIO, ...scenarioIn };
	let currentWarnings: ReportWarning[] | null = null;
	const column = (
		id: string,
		name: string,
		doc: BuildDocument,
		cost: number,
		baseBurpIn: number | null | undefined,
		baseAmps: ComparisonColumn['amplifiers'] | null,
	): ComparisonColumn => {
		const report = buildReport(doc, scenario, { burpRun: false });
		// The current build's findings are every plan's reference for what a plan brings.
		const baseWarnings = baseAmps === null ? undefined : (currentWarnings ?? []);
		if (baseAmps === null) currentWarnings = report.ok ? report.warnings : null;
		const run = report.ok
			? runBurp(doc, {
					engineRpm: scenario.engineRpm,
					demand: scenario.burpDemand,
					conductorTempC: scenario.conductorTempC,
					durationS: scenario.burpSeconds,
					stepS: scenario.burpStepS,
				})
			: null;
		const runMin = (id: string) => {
			const v = run?.amplifierMinV[id];
			return v !== undefined && Number.isFinite(v) && run!.collapsedAtS === null ? v : null;
		};
		// The report already solved the network at both demands: its solutions are the same ones.
		const burp = report.ok ? lowestOf(report.burp) : lowest(doc, scenario, scenario.burpDemand);
		const sustained = report.ok
			? lowestOf(report.sustained)
			: lowest(doc, scenario, scenario.sustainedDemand);
		const baseBurp = baseBurpIn === undefined ? burp : baseBurpIn;
		const weakest = report.ok
			? report.amplifiers.reduce(
					(w, a) => (a.burpTerminalV < w.burpTerminalV ? a : w),
					report.amplifiers[0]!,
				)
			: null;
		const ampDoc = weakest ? (doc.amplifiers.find((a) => a.id === weakest.id) ?? null) : null;
		const deltaDb =
			burp !== null && baseBurp !== null && ampDoc
				? outputLossDb(ampDoc, burp) - outputLossDb(ampDoc, baseBurp)
				: null;
		const session = report.ok
			? runSession(doc, {
					burpDemand: scenario.burpDemand,
					burpS: scenario.burpSeconds,
					engineRpm: scenario.engineRpm,
					conductorTempC: scenario.conductorTempC,
				})
			: null;
		const sessionSummary: ComparisonColumn['session'] = session
			? {
					burps: session.burps.length,
					firstBurpV: session.burps[0]?.lowestAmplifierV ?? null,
					lastBurpV: session.burps.at(-1)?.lowestAmplifierV ?? null,
					chargeLeftAh: doc.banks.reduce(
						(t, b) => t + session.endSoc[b.id]! * bankThevenin(b).capacityAh,
						0,
					),
					lowestSocPct: Math.min(100, ...doc.banks.map((b) => session.endSoc[b.id]! * 100)),
					collapsedAtS: session.collapsedAtS,
				}
			: null;
		const bankDraw = report.ok ? report.sustained.banks.reduce((s, b) => s + b.currentA, 0) : 0;
		return {
			id,
			name,
			lowestAmplifierV: { burp, sustained },
			deltaDb,
			carryHours: bankDraw > 0.5 ? banksCarryHours(doc.banks, bankDraw, scenario.cutoffV) : null,
			busV: report.ok
				? { burp: settled(report.burp), sustained: settled(report.sustained) }
				: { burp: null, sustained: null },
			amplifiers: report.ok
				? report.amplifiers.map((a) => ({
						id: a.id,
						label: a.label,
						burpV: a.burpTerminalV,
						sustainedV: a.sustainedTerminalV,
						burpRunMinV: runMin(a.id),
					}))
				: [],
			budget: report.ok
				? report.budget.map((r) => ({
						voltageV: r.voltageV,
						sustainedSurplusA: r.sustainedSurplusA,
						burpSurplusA: r.burpSurplusA,
						burpCarrySeconds: r.burpCarrySeconds,
					}))
				: [],
			warnings: report.ok ? report.warnings.length : 0,
			findings: report.ok ? findingCounts(report.warnings) : { danger: 0, warning: 0, info: 0 },
			addedDangers:
				report.ok && baseWarnings !== undefined
					? addedFindings(baseWarnings, report.warnings, ['danger']).map((w) => ({
							key: findingKey(w),
							message: w.message,
						}))
					: [],
			cableWarnings: report.ok
				? report.warnings
						.filter((w) => w.element.kind === 'cable' && w.severity !== 'info')
						.map((w) => w.message)
				: [],
			amplifierFindings: report.ok
				? report.warnings
						.filter((w) => w.element.kind === 'amplifier' && w.severity !== 'info')
						.map((w) => {
							const now = report.amplifiers.find((a) => a.id === w.element.id);
							const before = baseAmps?.find((a) => a.id === w.element.id);
							return {
								amplifierId: w.element.id,
								message: w.message,
								changeV:
									now && before && report.burp.status === 'ok' && baseBurpIn !== null
										? now.burpTerminalV - before.burpV
										: null,
							};
						})
				: [],
			safetyFindings: report.ok ? report.warnings.filter((w) => w.safety).length : 0,
			cost,
			hottestCable: report.ok
				? report.cables.reduce<ComparisonColumn['hottestCable']>(
						(h, c) =>
							h === null || c.burpHeating.finalC - c.burpHeating.limitC > h.finalC - h.limitC
								? { label: c.label, finalC: c.burpHeating.finalC, limitC: c.burpHeating.limitC }
								: h,
						null,
					)
				: null,
			carriesMusicFromRpm: report.ok
				? (speedSweep(doc, scenario).sustained.find((p) => !p.collapse && p.bankA <= 0.5)
						?.engineRpm ?? null)
				: null,
			session: sessionSummary,
			engineOffPlayS: report.ok
				? engineOffPlayTime(doc, {
						demand: scenario.sustainedDemand,
						conductorTempC: scenario.conductorTempC,
						cutoffV: scenario.cutoffV,
					}).seconds
				: null,
			dbPerMoney: deltaDb !== null && deltaDb > 0 && cost > 0 ? deltaDb / cost : null,
		};
	};
	// The current build is its own baseline; each plan is measured against its burp voltage.
	const base = column('current', 'Current build', current, 0, undefined, null);
	const baseBurp = base.lowestAmplifierV.burp;
	return [
		base,
		...plans.map((p) => column(p.id, p.name, p.document, p.cost, baseBurp, base.amplifiers)),
	];
}
