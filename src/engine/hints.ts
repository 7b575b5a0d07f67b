import { outputLossDb } from './amplifier';
import { bankChargeTargets } from './battery';
import { solveNetwork } from './solve';
import { AWG_SIZES, type BuildDocument, type Cable, type CableSize } from './types';

/** IEC 60228 nominal cross-sections (mm²) used for metric cables. */
export const IEC_SIZES_MM2 = [
	1.5, 2.5, 4, 6, 10, 16, 25, 35, 50, 70, 95, 120, 150, 185, 240,
] as const;

export interface UpgradeHint {
	kind: 'upsize_cable' | 'add_bank' | 'raise_set_point' | 'second_alternator';
	/** The part the change starts from. */
	targetId: string;
	description: string;
	/** Lowest amplifier terminal voltage under burp, before and after the change (V). */
	beforeV: number;
	afterV: number;
	gainV: number;
	/**
	 * Output gained at the weakest amplifier of the changed build, in dB (its loss against its rating
	 * at `afterV` less that at `beforeV`): the same figure the plan comparison shows for a plan made
	 * of this change. Null when either build collapses under the burp.
	 */
	gainDb: number | null;
	/** The changed build, ready to become a plan. */
	document: BuildDocument;
}

/** The next size up for a cable, or one more parallel run when it is already the largest size. */
export function nextSize(cable: Cable): Pick<Cable, 'size' | 'parallelRuns'> {
	const s = cable.size;
	if (s.kind === 'awg') {
		const i = AWG_SIZES.indexOf(s.awg);
		return i < AWG_SIZES.length - 1
			? { size: { kind: 'awg', awg: AWG_SIZES[i + 1]! }, parallelRuns: cable.parallelRuns }
			: { size: s, parallelRuns: cable.parallelRuns + 1 };
	}
	const area = s.kind === 'mm2' ? s.mm2 : s.areaMm2;
	const next = IEC_SIZES_MM2.find((x) => x > area * 1.0001);
	const size: CableSize = next ? { kind: 'mm2', mm2: next } : s;
	return next
		? { size, parallelRuns: cable.parallelRuns }
		: { size, parallelRuns: cable.parallelRuns + 1 };
}

function weakestAmp(
	doc: BuildDocument,
	conditions: { engineRpm: number; demand: number; conductorTempC: number },
): { v: number; id: string | null } {
	const s = solveNetwork(doc, conditions);
	// A collapsed system has no operating point at this demand: count it as no voltage at all.
	if (s.status === 'collapse') return { v: 0, id: null };
	const weakest = s.amplifiers.reduce((w, a) => (a.terminalV < w.terminalV ? a : w));
	return { v: weakest.terminalV, id: weakest.id };
}

function freshId(doc: BuildDocument, base: string): string {
	const used = new Set([...doc.alternators, ...doc.banks].map((x) => x.id));
	for (let i = 2; ; i++) if (!used.has(`${base}-${i}`)) return `${base}-${i}`;
}

/**
 * Single changes ranked by the voltage they give back at the weakest amplifier under burp: each
 * cable one size up (or one more run at 4/0), one more string in each bank (a bank like it in
 * parallel), each regulator raised to the lowest absorption voltage of the banks it charges (never
 * past any bank's limit), and a second alternator like the first. Each is one network solve.
 */
export function upgradeHints(
	doc: BuildDocument,
	conditions: { engineRpm: number; demand: number; conductorTempC: number },
): UpgradeHint[] {
	if (doc.amplifiers.length === 0) return [];
	const beforeV = weakestAmp(doc, conditions).v;
	const hints: UpgradeHint[] = [];
	const consider = (
		kind: UpgradeHint['kind'],
		targetId: string,
		description: string,
		change: (d: BuildDocument) => void,
	) => {
		const next = structuredClone(doc);
		change(next);
		const after = weakestAmp(next, conditions);
		const afterV = after.v;
		const amp = after.id ? next.amplifiers.find((a) => a.id === after.id) : undefined;
		hints.push({
			kind,
			targetId,
			description,
			beforeV,
			afterV,
			gainV: afterV - beforeV,
			gainDb: amp && beforeV > 0 ? outputLossDb(amp, afterV) - outputLossDb(amp, beforeV) : null,
			document: next,
		});
	};
	for (const cable of doc.cables) {
		const up = nextSize(cable);
		const label =
			up.size.kind === 'awg'
				? `${up.size.awg} AWG`
				: up.size.kind === 'mm2'
					? `${up.size.mm2} mm²`
					: 'a larger size';
		const text =
			up.parallelRuns > cable.parallelRuns
				? `Add a parallel run to "${cable.label}"`
				: `Upsize "${cable.label}" to ${label}`;
		consider('upsize_cable', cable.id, text, (d) =>
			Object.assign(
				d.cables.find((c) => c.id === cable.id)!,
				up,
			),
		);
	}
	for (const bank of doc.banks) {
		consider('add_bank', bank.id, `Add a bank like "${bank.label}" beside it`, (d) => {
			d.banks.find((b) => b.id === bank.id)!.stringsInParallel += 1;
		});
	}
	const ceiling = doc.banks.length
		? Math.min(...doc.banks.map((b) => bankChargeTargets(b).absorptionV))
		: null;
	for (const alt of doc.alternators) {
		if (ceiling !== null && ceiling > alt.setPointV + 0.05) {
			consider(
				'raise_set_point',
				alt.id,
				`Raise "${alt.label}" to ${ceiling.toFixed(2)} V (the lowest bank absorption voltage)`,
				(d) => {
					d.alternators.find((a) => a.id === alt.id)!.setPointV = ceiling;
				},
			);
		}
	}
	const first = doc.alternators[0];
	if (first) {
		consider('second_alternator', first.id, `Add an alternator like "${first.label}"`, (d) => {
			d.alternators.push({
				...structuredClone(first),
				id: freshId(d, first.id),
				label: `${first.label} (second)`,
			});
		});
	}
	return hints.sort((a, b) => b.gainV - a.gainV);
}
