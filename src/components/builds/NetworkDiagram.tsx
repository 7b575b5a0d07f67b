import { useMemo } from 'react';
import { cableAreaMm2 } from '@/engine/conductors';
import type { BuildDocument, NodeKind, PartGroup } from '@/engine';

const COLUMN: Record<NodeKind, number> = {
	alternator: 0,
	junction: 0,
	battery: 1,
	block: 2,
	amplifier: 3,
	chassis: 4,
};
const W = 880;
const H = 300;

/**
 * A schematic of the build drawn from the document: supply-side nodes above, ground-side nodes
 * below, columns from the engine bay (alternators) to the amplifiers; cables as lines whose width
 * follows their cross-section; parts as dashed links between their terminals.
 */
export function layoutNetwork(doc: BuildDocument) {
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
	const slots = new Map<string, number>();
	const pos = new Map<string, { x: number; y: number }>();
	for (const n of doc.nodes) {
		if (n.kind === 'chassis') continue;
		const side = ground.has(n.id) ? 'g' : 's';
		const key = `${side}${COLUMN[n.kind]}`;
		const k = slots.get(key) ?? 0;
		slots.set(key, k + 1);
		const x = 70 + COLUMN[n.kind] * 200 + (k % 2) * 60;
		const y = side === 's' ? 40 + Math.floor(k / 1) * 26 : 190 + Math.floor(k / 1) * 18;
		pos.set(n.id, { x, y: Math.min(y, side === 's' ? 165 : 255) });
	}
	if (chassis) pos.set(chassis.id, { x: W / 2, y: 285 });
	return { pos, ground };
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
	const { pos, ground } = useMemo(() => layoutNetwork(doc), [doc]);
	const parts = [
		...doc.banks.map((b) => ({ ...b, colour: '#0f7076', group: 'banks' as const })),
		...doc.alternators.map((a) => ({ ...a, colour: '#0f7076', group: 'alternators' as const })),
		...doc.amplifiers.map((a) => ({ ...a, colour: '#a85a23', group: 'amplifiers' as const })),
		...doc.loads.map((l) => ({ ...l, colour: '#55616b', group: 'loads' as const })),
	];
	return (
		<svg
			viewBox={`0 0 ${W} ${H}`}
			className="w-full rounded-md border border-hairline bg-card"
			role="img"
			aria-label="Diagram of the build: sources, cables and loads"
		>
			<line x1={40} x2={W - 40} y1={285} y2={285} stroke="#1d262e" strokeWidth={3} />
			<text x={W - 44} y={279} textAnchor="end" fontSize={11} fill="#55616b">
				chassis (0 V)
			</text>
			{doc.cables.map((c) => {
				const a = pos.get(c.from);
				const b = pos.get(c.to);
				if (!a || !b) return null;
				const width = Math.min(7, 1 + Math.sqrt(cableAreaMm2(c.size) * c.parallelRuns) / 2.5);
				const colour = flagged.has(c.id)
					? '#b3261e'
					: ground.has(c.from) && ground.has(c.to)
						? '#2a3844'
						: '#a85a23';
				return (
					<line
						key={c.id}
						x1={a.x}
						y1={a.y}
						x2={b.x}
						y2={b.y}
						stroke={colour}
						strokeWidth={width}
						strokeLinecap="round"
						strokeDasharray={flagged.has(c.id) ? '7 3' : undefined}
						onClick={onSelect && (() => onSelect('cables', c.id))}
						className={onSelect ? 'cursor-pointer' : undefined}
					>
						<title>{`${c.label}${flagged.has(c.id) ? ' — has a finding' : ''}`}</title>
					</line>
				);
			})}
			{parts.map((p) => {
				const a = pos.get(p.positive);
				const b = pos.get(p.negative);
				if (!a || !b) return null;
				return (
					<g
						key={p.id}
						onClick={onSelect && (() => onSelect(p.group, p.id))}
						className={onSelect ? 'cursor-pointer' : undefined}
					>
						<line
							x1={a.x}
							y1={a.y}
							x2={b.x}
							y2={b.y}
							stroke={p.colour}
							strokeWidth={1.5}
							strokeDasharray="3 3"
						/>
						<text x={(a.x + b.x) / 2 + 6} y={(a.y + b.y) / 2} fontSize={10} fill={p.colour}>
							{p.label}
						</text>
					</g>
				);
			})}
			{doc.nodes
				.filter((n) => n.kind !== 'chassis')
				.map((n) => {
					const p = pos.get(n.id)!;
					return (
						<g key={n.id}>
							<circle
								cx={p.x}
								cy={p.y}
								r={4.5}
								fill={ground.has(n.id) ? '#2a3844' : '#f7f5f0'}
								stroke="#1d262e"
							/>
							<text x={p.x + 7} y={p.y - 6} fontSize={10} fill="#1d262e">
								{n.label}
							</text>
						</g>
					);
				})}
		</svg>
	);
}
