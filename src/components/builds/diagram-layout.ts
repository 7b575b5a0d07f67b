import { partsOf, type TERMINAL_GROUPS, type BuildDocument, type NodeKind } from '@/engine/browser';

/** Where a node's kind sits from the engine bay (left) to the amplifiers (right). */
const RANK: Record<NodeKind, number> = {
	alternator: 0,
	junction: 0,
	battery: 1,
	block: 2,
	amplifier: 3,
	chassis: 4,
};

/** Every length in px at 1:1: the diagram is never scaled down, so its text stays 11 px. */
export const DIAGRAM = {
	fontPx: 11,
	lineH: 13,
	colW: 112,
	margin: 28,
	/** Supply-side node row, and ground-side node row. */
	supplyY: 118,
	groundY: 276,
	/** How far an arc may rise above the supply row (or fall below the ground row). */
	arcMax: 72,
	/** Characters per label line (11 px text in a column). */
	lineChars: 16,
} as const;
export const H = DIAGRAM.groundY + DIAGRAM.arcMax + 2 * DIAGRAM.lineH + 16;

/** A label in at most `lines` lines of `DIAGRAM.lineChars`, the last cut with an ellipsis. */
export function wrapLabel(text: string, lines: number): string[] {
	const out: string[] = [];
	let line = '';
	for (const word of text.split(/\s+/).filter(Boolean)) {
		const next = line ? `${line} ${word}` : word;
		if (next.length <= DIAGRAM.lineChars) line = next;
		else {
			if (line) out.push(line);
			line = word;
		}
	}
	if (line) out.push(line);
	const kept = out.slice(0, lines).map((l) => l.slice(0, DIAGRAM.lineChars));
	if (out.length > lines || out.some((l) => l.length > DIAGRAM.lineChars)) {
		const last = kept[kept.length - 1] ?? '';
		kept[kept.length - 1] = `${last.slice(0, DIAGRAM.lineChars - 1)}…`;
	}
	return kept;
}

interface Part {
	id: string;
	label: string;
	positive: string;
	negative: string;
	group: (typeof TERMINAL_GROUPS)[number];
}

interface Column {
	rank: number;
	part?: Part;
	supply?: string;
	ground?: string;
}

/**
 * The diagram's layout: one column per part (its link runs straight down its own column, from its
 * positive terminal on the supply row to its negative on the ground row) and one per node no part
 * sits on, ordered from the engine bay to the amplifiers. Cables are arcs above the supply row and
 * below the ground row, node names sit outside the arcs, part names inside their own box: no wire
 * crosses a name.
 */
export function layoutNetwork(doc: BuildDocument) {
	const kindOf = new Map(doc.nodes.map((n) => [n.id, n.kind]));
	const chassis = doc.nodes.find((n) => n.kind === 'chassis');
	// Ground side: nodes reached from the chassis through cables alone.
	const ground = new Set<string>(chassis ? [chassis.id] : []);
	let grew = true;
	while (grew) {
		grew = false;
		for (const c of doc.cables) {
			if (ground.has(c.from) !== ground.has(c.to)) {
				ground.add(ground.has(c.from) ? c.to : c.from);
				grew = true;
			}
		}
	}
	const rowOf = (id: string) => (ground.has(id) ? 'ground' : 'supply');
	const rankOf = (id: string) => RANK[kindOf.get(id) ?? 'junction'];
	const parts: Part[] = [
		...doc.alternators.map((p) => ({ ...p, group: 'alternators' as const })),
		...doc.banks.map((p) => ({ ...p, group: 'banks' as const })),
		...partsOf(doc, 'capacitors').map((p) => ({ ...p, group: 'capacitors' as const })),
		...doc.loads.map((p) => ({ ...p, group: 'loads' as const })),
		...doc.amplifiers.map((p) => ({ ...p, group: 'amplifiers' as const })),
	];
	const columns: Column[] = [];
	const nodeColumn = new Map<string, Column>();
	const place = (id: string, column: Column) => {
		if (nodeColumn.has(id) || !kindOf.has(id)) return;
		const row = rowOf(id);
		if (column[row] === undefined) {
			column[row] = id;
			nodeColumn.set(id, column);
		}
	};
	for (const part of parts) {
		const column: Column = { rank: rankOf(part.positive), part };
		columns.push(column);
		place(part.positive, column);
		place(part.negative, column);
	}
	for (const n of doc.nodes) {
		if (nodeColumn.has(n.id)) continue;
		const row = rowOf(n.id);
		const rank = RANK[n.kind];
		let column = columns.find((c) => !c.part && c.rank === rank && c[row] === undefined);
		if (!column) columns.push((column = { rank }));
		place(n.id, column);
	}
	// Stable: parts keep their document order within a rank.
	const ordered = columns
		.map((c, i) => ({ c, i }))
		.sort((a, b) => a.c.rank - b.c.rank || a.i - b.i)
		.map(({ c }) => c);
	const x = (i: number) => DIAGRAM.margin + DIAGRAM.colW * i + DIAGRAM.colW / 2;
	const columnX = new Map(ordered.map((c, i) => [c, x(i)]));
	const pos = new Map<string, { x: number; y: number }>();
	for (const [id, c] of nodeColumn)
		pos.set(id, {
			x: columnX.get(c)!,
			y: rowOf(id) === 'ground' ? DIAGRAM.groundY : DIAGRAM.supplyY,
		});
	const partX = new Map(ordered.filter((c) => c.part).map((c) => [c.part!.id, columnX.get(c)!]));
	return {
		pos,
		ground,
		parts,
		partX,
		width: Math.max(DIAGRAM.margin * 2 + DIAGRAM.colW * ordered.length, 480),
	};
}

/** An arc between two nodes of one row: up from the supply row, down from the ground row. */
export function arcPath(a: { x: number; y: number }, b: { x: number; y: number }, lift: number) {
	const up = a.y === DIAGRAM.supplyY ? -1 : 1;
	const span = Math.abs(a.x - b.x) / DIAGRAM.colW;
	const h = Math.min(DIAGRAM.arcMax, 16 + 12 * span + lift);
	// A quadratic curve peaks half-way to its control point.
	return `M ${a.x} ${a.y} Q ${(a.x + b.x) / 2} ${a.y + up * 2 * h} ${b.x} ${b.y}`;
}
