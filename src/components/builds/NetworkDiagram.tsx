import { useMemo } from 'react';
import {
	cableAreaMm2,
	partsOf,
	PART_KINDS,
	type BuildDocument,
	type PartGroup,
} from '@/engine/browser';
import { ScrollRegion } from '@/components/ui/ScrollRegion';
import { useDetailsOpen } from '@/lib/client/use-details-open';
import { useHydrated } from '@/lib/client/use-hydrated';
import { arcPath, DIAGRAM, H, layoutNetwork, wrapLabel } from './diagram-layout';
import { UI_PART_KINDS } from './part-kinds';

export { DIAGRAM, layoutNetwork, wrapLabel };

/** A box part's colour in the diagram, from the interface's registry. */
const colourOf = (group: PartGroup) => {
	const glyph = UI_PART_KINDS[group].glyph;
	return glyph.shape === 'box' ? glyph.colour : '#55616b';
};

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
	// The drawing sits below the first screens and is a third of the page's markup: the server sends
	// its frame at its size (nothing moves), and the live page draws it.
	const drawn = useHydrated();
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
					data-drawn={drawn || undefined}
				>
					{!drawn && (
						<text x={16} y={H / 2} fontSize={13} fill="#55616b">
							Drawing the network…
						</text>
					)}
					{drawn &&
						doc.cables.map((c) => {
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
					{drawn &&
						(['isolators', 'chargers'] as const).flatMap((group) =>
							(
								partsOf(doc, group) as Array<{
									id: string;
									label: string;
									from: string;
									to: string;
								}>
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
					{drawn &&
						parts.map((p, k) => {
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
					{drawn &&
						doc.nodes.map((n) => {
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
