import { partsOf } from './part-kinds';
import type { NetworkSolution } from './solve';
import type { BuildDocument } from './types';

/** One source's part in the current that reaches an amplifier's positive terminal. */
export interface FeedShare {
	kind: 'bank' | 'alternator';
	id: string;
	label: string;
	/** Fraction of the amplifier's feed current that came from this source (0..1). */
	share: number;
	/** The source's own terminal voltage, positive minus negative (V). */
	terminalV: number;
}

/**
 * Where an amplifier's drop is measured from. `feeding`: the terminals of the sources whose current
 * reaches it, weighted by their shares; `strongest`: no source current reaches it (nothing flows,
 * or the network collapsed to no demand), so the strongest source's terminals stand in.
 */
export interface FeedReference {
	kind: 'feeding' | 'strongest';
	referenceV: number;
	sources: FeedShare[];
}

/** Currents below this are treated as no flow when tracing (A). */
const TRACE_FLOOR_A = 1e-9;

/**
 * Traces which sources feed each amplifier by proportional sharing: in a resistive network current
 * flows from a higher to a lower potential, so taking the nodes from the highest voltage down, the
 * current leaving a node carries the same mix of sources as all the current that entered it
 * (J. Bialek, "Tracing the flow of electricity", IEE Proc. Gener. Transm. Distrib. 143(4), 1996).
 * An amplifier's reference is its feeding sources' terminal voltages weighted by their shares: the
 * drop from there to the amplifier's terminals is what its own feed and return lose.
 */
export function traceFeeds(doc: BuildDocument, sol: NetworkSolution): Map<string, FeedReference> {
	const v = (id: string) => sol.nodeVoltages[id] ?? 0;
	const sources: Array<{
		kind: 'bank' | 'alternator';
		id: string;
		label: string;
		node: string;
		currentA: number;
		terminalV: number;
	}> = [];
	const collect = (
		kind: 'bank' | 'alternator',
		parts: ReadonlyArray<{ id: string; label: string; positive: string }>,
		results: ReadonlyArray<{ currentA: number; terminalV: number } | undefined>,
	) =>
		parts.forEach((p, i) => {
			const r = results[i];
			if (r && r.currentA > TRACE_FLOOR_A)
				sources.push({
					kind,
					id: p.id,
					label: p.label,
					node: p.positive,
					currentA: r.currentA,
					terminalV: r.terminalV,
				});
		});
	collect('bank', doc.banks, sol.banks);
	collect('alternator', doc.alternators, sol.alternators);
	const nodeIds = doc.nodes.map((n) => n.id);
	const slot = new Map(nodeIds.map((id, i) => [id, i]));
	const count = sources.length;
	// Current entering each node (A), and how much of it came from each source (A).
	const inflow = new Float64Array(nodeIds.length);
	const fromSource = new Float64Array(nodeIds.length * count);
	const addInflow = (node: string, amps: number, source: number) => {
		const i = slot.get(node);
		if (i === undefined || !(amps > TRACE_FLOOR_A)) return;
		inflow[i] += amps;
		if (source >= 0) fromSource[i * count + source] += amps;
	};
	sources.forEach((s, k) => addInflow(s.node, s.currentA, k));
	// Current other elements push into a node (amplifiers' and loads' returns, a charging bank's
	// negative terminal) enters it with no source attached: it dilutes the mix, as it should.
	doc.amplifiers.forEach((a, i) => addInflow(a.negative, sol.amplifiers[i]?.currentA ?? 0, -1));
	doc.loads.forEach((l, i) => addInflow(l.negative, sol.loads[i]?.currentA ?? 0, -1));
	doc.banks.forEach((b, i) => addInflow(b.negative, -(sol.banks[i]?.currentA ?? 0), -1));
	doc.alternators.forEach((a, i) =>
		addInflow(a.negative, -(sol.alternators[i]?.currentA ?? 0), -1),
	);
	// Cables as directed edges from the higher to the lower potential.
	const into: Array<Array<{ from: number; amps: number }>> = nodeIds.map(() => []);
	doc.cables.forEach((c, i) => {
		const amps = sol.cables[i]?.currentA ?? 0;
		if (Math.abs(amps) <= TRACE_FLOOR_A) return;
		const [up, down] = amps > 0 ? [c.from, c.to] : [c.to, c.from];
		const u = slot.get(up);
		const d = slot.get(down);
		if (u === undefined || d === undefined) return;
		into[d]!.push({ from: u, amps: Math.abs(amps) });
	});
	// Relays and isolators carry current the same way (solution and document in the same order).
	partsOf(doc, 'isolators').forEach((x, i) => {
		const amps = sol.isolators[i]?.currentA ?? 0;
		if (Math.abs(amps) <= TRACE_FLOOR_A) return;
		const [up, down] = amps > 0 ? [x.from, x.to] : [x.to, x.from];
		const u = slot.get(up);
		const d = slot.get(down);
		if (u === undefined || d === undefined) return;
		into[d]!.push({ from: u, amps: Math.abs(amps) });
	});
	const order = nodeIds.map((_, i) => i).sort((a, b) => v(nodeIds[b]!) - v(nodeIds[a]!));
	const mix = new Float64Array(nodeIds.length * count);
	for (const i of order) {
		let total = inflow[i]!;
		const acc = fromSource.subarray(i * count, (i + 1) * count).slice();
		for (const e of into[i]!) {
			total += e.amps;
			for (let k = 0; k < count; k++) acc[k] += e.amps * mix[e.from * count + k]!;
		}
		if (total > TRACE_FLOOR_A) for (let k = 0; k < count; k++) mix[i * count + k] = acc[k]! / total;
	}
	const strongestV = Math.max(
		0,
		...sol.banks.map((b) => b.terminalV),
		...sol.alternators.filter((a) => a.mode !== 'off').map((a) => a.terminalV),
	);
	const out = new Map<string, FeedReference>();
	for (const amp of doc.amplifiers) {
		const i = slot.get(amp.positive);
		const shares: FeedShare[] = [];
		let sum = 0;
		if (i !== undefined)
			sources.forEach((s, k) => {
				const share = mix[i * count + k]!;
				if (share > 1e-6) {
					shares.push({ kind: s.kind, id: s.id, label: s.label, share, terminalV: s.terminalV });
					sum += share;
				}
			});
		if (sum <= 1e-6) {
			out.set(amp.id, { kind: 'strongest', referenceV: strongestV, sources: [] });
			continue;
		}
		const normalised = shares
			.map((s) => ({ ...s, share: s.share / sum }))
			.sort((a, b) => b.share - a.share);
		out.set(amp.id, {
			kind: 'feeding',
			referenceV: normalised.reduce((t, s) => t + s.share * s.terminalV, 0),
			sources: normalised,
		});
	}
	return out;
}

/** "Front bank 70 %, Alternator 30 %": the feeding sources, for a finding. */
export function describeFeed(ref: FeedReference): string {
	if (ref.kind === 'strongest') return 'the strongest source';
	if (ref.sources.length === 1) return `"${ref.sources[0]!.label}"`;
	const shown = ref.sources.slice(0, 3).map((s) => `"${s.label}" ${Math.round(s.share * 100)} %`);
	const rest = ref.sources.length - shown.length;
	return `the sources that feed it (${shown.join(', ')}${rest > 0 ? `, ${rest} more` : ''})`;
}
