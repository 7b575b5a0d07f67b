import { PART_KINDS, partsOf, type BuildDocument } from '@/engine/browser';
import { GROUP_NAMES } from '@/lib/format';
import type { Selection } from './Inspector';
import { EDITOR_ORDER } from './part-kinds';

/** Parts of a group listed as buttons before "and N more". */
const LISTED_PARTS = 60;

/** The groups listed as buttons: every kind but the nodes, in the editor's order. */
const LIST_GROUPS = EDITOR_ORDER.filter((g) => g !== 'nodes');

/** Every part as a button, by group, marked when it has a finding: the way into the inspector. */
export function PartLists({
	draft,
	warned,
	selected,
	onSelect,
}: {
	draft: BuildDocument;
	flagged: Set<string>;
	warned: Array<{ element: { kind: string; id: string }; severity: string }>;
	selected: Selection | null;
	onSelect: (s: Selection) => void;
}) {
	const worst = (kind: string, id: string) => {
		const ws = warned.filter((w) => w.element.kind === kind && w.element.id === id);
		return ws.some((w) => w.severity === 'danger')
			? 'danger'
			: ws.some((w) => w.severity === 'warning')
				? 'warning'
				: null;
	};
	return (
		<nav aria-label="Parts of the build" className="mt-3 flex flex-col gap-2 text-sm">
			{LIST_GROUPS.filter((g) => partsOf(draft, g).length > 0).map((group) => (
				<div key={group} className="flex flex-wrap items-center gap-1.5">
					<span className="w-24 shrink-0 text-xs font-semibold text-ink-soft uppercase">
						{GROUP_NAMES[group]}s
					</span>
					{(partsOf(draft, group) as Array<{ id: string; label: string }>)
						.slice(0, LISTED_PARTS)
						.map((p) => {
							const w = worst(PART_KINDS[group].element, p.id);
							const on = selected?.group === group && selected.id === p.id;
							return (
								<button
									key={p.id}
									type="button"
									aria-pressed={on}
									onClick={() => onSelect({ group, id: p.id })}
									className={`max-w-full truncate rounded-md border px-2 py-0.5 ${on ? 'border-copper bg-copper-tint' : 'border-hairline bg-card hover:border-copper'}`}
								>
									{w && (
										<span className={w === 'danger' ? 'text-brick' : 'text-amber-text'}>
											{w === 'danger' ? '✕ ' : '! '}
											<span className="sr-only">{w === 'danger' ? 'danger: ' : 'warning: '}</span>
										</span>
									)}
									{p.label || p.id}
								</button>
							);
						})}
					{partsOf(draft, group).length > LISTED_PARTS && (
						<span className="text-xs text-ink-soft">
							and {partsOf(draft, group).length - LISTED_PARTS} more (in the tables below)
						</span>
					)}
				</div>
			))}
		</nav>
	);
}
