import { findingCounts } from './findings';
import type { BuildReport, Severity } from './report';

/** The figures a team looks at first, from one report (the summary strip, the team page). */
export interface HeadlineFigures {
	/** The system collapses under burp: the voltages below are then null. */
	collapse: boolean;
	/** What the system settles at under burp: the strongest source's terminal voltage (V). */
	settleV: number | null;
	/** The lowest amplifier terminal voltage under burp (V); null without an amplifier. */
	lowestAmpV: number | null;
	/** The worst amplifier output loss against its rating under burp (dB, ≤ 0). */
	worstLossDb: number;
	/** The alternators' share of the burp current (0–1). */
	alternatorShare: number;
	/** Net bank current during sustained music (A; positive out of the banks). */
	bankCurrentA: number;
	/** Power lost in cables under burp (W). */
	cableLossW: number;
	findings: Record<Severity, number>;
}

export function headlineFigures(report: Extract<BuildReport, { ok: true }>): HeadlineFigures {
	const { burp, sustained } = report;
	const collapse = burp.status === 'collapse';
	const findings = findingCounts(report.warnings);
	return {
		collapse,
		settleV: collapse
			? null
			: Math.max(
					0,
					...burp.banks.map((b) => b.terminalV),
					...burp.alternators.filter((a) => a.mode !== 'off').map((a) => a.terminalV),
				),
		lowestAmpV:
			collapse || report.amplifiers.length === 0
				? null
				: Math.min(...report.amplifiers.map((a) => a.burpTerminalV)),
		worstLossDb: Math.min(0, ...report.amplifiers.map((a) => a.burpOutputLossDb)),
		alternatorShare: burp.alternators.reduce((s, a) => s + a.share, 0),
		bankCurrentA: sustained.banks.reduce((s, b) => s + b.currentA, 0),
		cableLossW: burp.power.cableLossW,
		findings,
	};
}
