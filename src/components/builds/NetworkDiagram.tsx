import { useMemo } from 'react';
import {
	cableAreaMm2,
	partsOf,
	PART_KINDS,
	type TERMINAL_GROUPS,
	type BuildDocument,
	type NodeKind,
	type PartGroup,
} from '@/engine/browser';
import { ScrollRegion } from '@/components/ui/ScrollRegion';
import { useDetailsOpen } from '@/lib/client/use-details-open';
import { UI_PART_KINDS } from './part-kinds';

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
const H = DIAGRAM.groundY + DIAGRAM.arcMax + 2 * DIAGRAM.lineH + 16;

/** A box part's colour in the diagram, from the interface's registry. */
const colourOf = (group: PartGroup) => {
	const glyph = UI_PART_KINDS[group].glyph;
	return glyph.shape === 'box' ? glyph.colour : '#55616b';
};

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
function arcPath(a: { x: number; y: number }, b: { x: number; y: number }, lift: number) {
	const up = a.y === DIAGRAM.supplyY ? -1 : 1;
	const span = Math.abs(a.x - b.x) / DIAGRAM.colW;
	const h = Math.min(DIAGRAM.arcMax, 16 + 12 * span + lift);
	// A quadratic curve peaks half-way to its control point.
	return `M ${a.x} ${a.y} Q ${(a.x + b.x) / 2} ${a.y + up * 2 * h} ${b.x} ${b.y}`;
}

export function NetworkDiagram({
	doc,
	flagged,
	onSelect,
}: {
	doc: BuildDocument;
	flagged: Set<string>;
	/** A click on a cable or a part opens it (the part lists beside are the keyboard's way in). */
	onSelect?: (group: PartGroup, id: string) => void;
}) {
	const layout = useMemo(() => layoutNetwork(doc), [doc]);
	const { ref: listRef, open: listed, onToggle: onListToggle } = useDetailsOpen();
	const { pos, ground, parts, partX, width } = layout;
	const nodeLabel = new Map(doc.nodes.map((n) => [n.id, n.label || n.id]));
	const pairs = new Map<string, number>();
	const midY = (DIAGRAM.supplyY + DIAGRAM.groundY) / 2;
	return (
		<figure>
			<ScrollRegion
				label="Diagram of the build (scrolls sideways)"
				className="rounded-md border border-hairline bg-card"
			>
				<svg
					width={width}
					height={H}
					viewBox={`0 0 ${width} ${H}`}
					className="block max-w-none"
					role="img"
					aria-label="Diagram of the build: supply side above, ground side below, a column per part"
					data-network-diagram
				>
					{doc.cables.map((c) => {
						const a = pos.get(c.from);
						const b = pos.get(c.to);
						if (!a || !b) return null;
						const pair = [c.from, c.to].sort().join('|');
						const lift = (pairs.get(pair) ?? 0) * 10;
						pairs.set(pair, (pairs.get(pair) ?? 0) + 1);
						const strokeWidth = Math.min(
							7,
							1 + Math.sqrt(cableAreaMm2(c.size) * c.parallelRuns) / 2.5,
						);
						const colour = flagged.has(c.id)
							? '#b3261e'
							: ground.has(c.from) && ground.has(c.to)
								? '#2a3844'
								: '#a85a23';
						return (
							<path
								key={c.id}
								d={arcPath(a, b, lift)}
								fill="none"
								stroke={colour}
								strokeWidth={strokeWidth}
								strokeLinecap="round"
								strokeDasharray={flagged.has(c.id) ? '7 3' : undefined}
								onClick={onSelect && (() => onSelect('cables', c.id))}
								className={onSelect ? 'cursor-pointer' : undefined}
								data-cable={c.id}
							>
								<title>{`${c.label}: ${nodeLabel.get(c.from)} to ${nodeLabel.get(c.to)}${flagged.has(c.id) ? ' (has a finding)' : ''}`}</title>
							</path>
						);
					})}
					{(['isolators', 'chargers'] as const).flatMap((group) =>
						(
							partsOf(doc, group) as Array<{ id: string; label: string; from: string; to: string }>
						).map((x) => {
							const a = pos.get(x.from);
							const b = pos.get(x.to);
							if (!a || !b) return null;
							const pair = [x.from, x.to].sort().join('|');
							const lift = (pairs.get(pair) ?? 0) * 10;
							pairs.set(pair, (pairs.get(pair) ?? 0) + 1);
							const glyph = UI_PART_KINDS[group].glyph;
							return (
								<path
									key={x.id}
									d={arcPath(a, b, lift)}
									fill="none"
									stroke={flagged.has(x.id) ? '#b3261e' : '#0f7076'}
									strokeWidth={3}
									strokeLinecap="round"
									strokeDasharray={glyph.shape === 'arc' ? glyph.dash : undefined}
									onClick={onSelect && (() => onSelect(group, x.id))}
									className={onSelect ? 'cursor-pointer' : undefined}
									data-link={group}
									data-isolator={group === 'isolators' ? x.id : undefined}
								>
									<title>{`${PART_KINDS[group].one} ${x.label}: ${nodeLabel.get(x.from)} to ${nodeLabel.get(x.to)}`}</title>
								</path>
							);
						}),
					)}
					{parts.map((p, k) => {
						const a = pos.get(p.positive);
						const b = pos.get(p.negative);
						const px = partX.get(p.id);
						if (!a || !b || px === undefined) return null;
						const colour = colourOf(p.group);
						const lines = wrapLabel(p.label || p.id, 3);
						const boxH = lines.length * DIAGRAM.lineH + 8;
						const top = midY - boxH / 2;
						// A terminal in another part's column joins this column by a short elbow near its row.
						const stub = 10 + (k % 6) * 5;
						const legTop =
							a.x === px
								? `M ${px} ${a.y} V ${top}`
								: `M ${a.x} ${a.y} V ${a.y + (a.y < midY ? stub : -stub)} H ${px} V ${top}`;
						const legBottom =
							b.x === px
								? `M ${px} ${top + boxH} V ${b.y}`
								: `M ${px} ${top + boxH} V ${b.y + (b.y < midY ? stub : -stub)} H ${b.x} V ${b.y}`;
						return (
							<g
								key={p.id}
								onClick={onSelect && (() => onSelect(p.group, p.id))}
								className={onSelect ? 'cursor-pointer' : undefined}
								data-part={p.id}
								data-column={px}
							>
								<title>{p.label || p.id}</title>
								<path
									d={`${legTop} ${legBottom}`}
									fill="none"
									stroke={colour}
									strokeWidth={1.5}
									strokeDasharray="3 3"
								/>
								<rect
									x={px - DIAGRAM.colW / 2 + 6}
									y={top}
									width={DIAGRAM.colW - 12}
									height={boxH}
									rx={4}
									fill="#fffdf8"
									stroke={colour}
									data-label-box
								/>
								<text
									x={px}
									y={top + 4 + DIAGRAM.fontPx}
									textAnchor="middle"
									fontSize={DIAGRAM.fontPx}
									fill={colour}
									data-label
								>
									{lines.map((l, i) => (
										<tspan key={i} x={px} dy={i === 0 ? 0 : DIAGRAM.lineH}>
											{l}
										</tspan>
									))}
								</text>
							</g>
						);
					})}
					{doc.nodes.map((n) => {
						const p = pos.get(n.id);
						if (!p) return null;
						const onGround = p.y === DIAGRAM.groundY;
						const lines = wrapLabel(n.label || n.id, 2);
						// Outside the arcs: above the supply side's, below the ground side's.
						const firstY = onGround
							? DIAGRAM.groundY + DIAGRAM.arcMax + 4 + DIAGRAM.fontPx
							: DIAGRAM.supplyY - DIAGRAM.arcMax - 4 - (lines.length - 1) * DIAGRAM.lineH;
						return (
							<g key={n.id} data-node={n.id}>
								<line
									x1={p.x}
									x2={p.x}
									y1={onGround ? p.y + 5 : p.y - 5}
									y2={
										onGround
											? firstY - DIAGRAM.fontPx - 1
											: firstY + (lines.length - 1) * DIAGRAM.lineH + 3
									}
									stroke="#c9c2b4"
									strokeWidth={1}
								/>
								<circle
									cx={p.x}
									cy={p.y}
									r={4.5}
									fill={ground.has(n.id) ? '#2a3844' : '#f7f5f0'}
									stroke="#1d262e"
								/>
								<text
									x={p.x}
									y={firstY}
									textAnchor="middle"
									fontSize={DIAGRAM.fontPx}
									fill="#1d262e"
									data-label
								>
									<title>{n.label || n.id}</title>
									{lines.map((l, i) => (
										<tspan key={i} x={p.x} dy={i === 0 ? 0 : DIAGRAM.lineH}>
											{l}
										</tspan>
									))}
								</text>
							</g>
						);
					})}
				</svg>
			</ScrollRegion>
			<figcaption className="mt-1 text-xs text-ink-soft">
				Supply side above, ground side below; each part in its own column between its terminals.
				Copper arcs: supply cables. Slate arcs: ground cables. Dashed red: a cable with a finding.
				Thicker arcs are larger cables. Dotted teal arcs: relays and isolators; dash-dot teal arcs:
				DC-DC chargers.
			</figcaption>
			<details ref={listRef} className="mt-2 text-sm" onToggle={onListToggle}>
				<summary className="cursor-pointer font-semibold text-teal">List the connections</summary>
				{/* Written out only once asked for: most page views never open it. */}
				{listed && (
					<ul className="mt-2 flex flex-col gap-0.5" data-connections>
						{doc.cables.map((c) => (
							<li key={c.id}>
								<span className="font-semibold">{c.label || c.id}</span>:{' '}
								{nodeLabel.get(c.from) ?? c.from} → {nodeLabel.get(c.to) ?? c.to}
								{flagged.has(c.id) && <span className="text-brick"> (has a finding)</span>}
							</li>
						))}
						{partsOf(doc, 'isolators').map((x) => (
							<li key={x.id}>
								<span className="font-semibold">{x.label || x.id}</span> ({x.kind}):{' '}
								{nodeLabel.get(x.from) ?? x.from} → {nodeLabel.get(x.to) ?? x.to}
							</li>
						))}
						{partsOf(doc, 'chargers').map((x) => (
							<li key={x.id}>
								<span className="font-semibold">{x.label || x.id}</span> (DC-DC charger):{' '}
								{nodeLabel.get(x.from) ?? x.from} → {nodeLabel.get(x.to) ?? x.to}
							</li>
						))}
						{parts.map((p) => (
							<li key={p.id}>
								<span className="font-semibold">{p.label || p.id}</span>: + on{' '}
								{nodeLabel.get(p.positive) ?? p.positive}, − on{' '}
								{nodeLabel.get(p.negative) ?? p.negative}
							</li>
						))}
					</ul>
				)}
			</details>
		</figure>
	);
}
