import { useEffect, useMemo, useState } from 'react';
import { PART_KINDS, partsOf, type BuildDocument, type PartGroup } from '@/engine/browser';
import type { UnitSystem } from '@/lib/format';
import { useHydrated } from '@/lib/client/use-hydrated';
import { AddPartForm } from './AddPartForm';
import { EDITOR_ORDER, UI_PART_KINDS } from './part-kinds';
import { MemoPartTable as PartTable, type PartColumn } from './PartTable';

type AnyPart = { id: string; label: string };

/** The part tables of a build or plan: every part editable in place, added and removed by group. */
export function PartEditor({
	draft,
	errors,
	units,
	canEdit,
	onChange,
	subject,
	flagged,
}: {
	draft: BuildDocument;
	errors: Record<string, string>;
	units: UnitSystem;
	canEdit: boolean;
	onChange: (update: (d: BuildDocument) => BuildDocument) => void;
	subject: string;
	flagged: Set<string>;
}) {
	const hydrated = useHydrated();
	// Columns stay the same objects while the nodes and units do, so unchanged rows skip rendering.
	const nodesKey = draft.nodes.map((n) => `${n.id}\u0000${n.label}`).join('\u0001');
	const cols = useMemo(() => {
		const nodeOptions = draft.nodes.map((n) => ({ value: n.id, label: n.label || n.id }));
		return Object.fromEntries(
			EDITOR_ORDER.map((g) => [g, UI_PART_KINDS[g].columns(nodeOptions, units)]),
		) as unknown as Record<PartGroup, PartColumn<AnyPart>[]>;
		// eslint-disable-next-line react-hooks/exhaustive-deps -- nodesKey stands for draft.nodes
	}, [nodesKey, units]);
	function update(group: PartGroup, index: number, next: AnyPart) {
		onChange((d) => ({
			...d,
			[group]: (partsOf(d, group) as AnyPart[]).map((x, i) => (i === index ? next : x)),
		}));
	}
	const [adding, setAdding] = useState<PartGroup | null>(null);
	// After a part is added, the work goes on in its row: focus moves to the new row's first field.
	const [focusGroup, setFocusGroup] = useState<PartGroup | null>(null);
	useEffect(() => {
		if (!focusGroup) return;
		const rows = document.querySelectorAll<HTMLElement>(
			`table[data-part-group="${focusGroup}"] tbody tr`,
		);
		const field = rows[rows.length - 1]?.querySelector<HTMLElement>('input, select, textarea');
		field?.focus();
		field?.scrollIntoView?.({ block: 'center' });
		setFocusGroup(null);
	}, [draft, focusGroup]);
	/** The group's "+ Add" opens a form that asks where the part goes. */
	const add = (group: PartGroup) => (canEdit ? () => setAdding(group) : undefined);
	const addForm = (group: PartGroup) =>
		adding === group && (
			<AddPartForm
				group={group}
				draft={draft}
				onCancel={() => setAdding(null)}
				onAdd={(change) => {
					onChange(change);
					setAdding(null);
					setFocusGroup(group);
				}}
			/>
		);
	function remove(group: PartGroup, index: number) {
		onChange((d) => ({
			...d,
			[group]: (partsOf(d, group) as AnyPart[]).filter((_, i) => i !== index),
		}));
	}
	return (
		<section aria-labelledby="edit-heading" className="flex flex-col gap-6">
			<div>
				<h3 id="edit-heading" className="text-lg font-bold">
					{canEdit ? `Edit the ${subject}` : `The ${subject}`}
				</h3>
				<p className="text-sm text-ink-soft">
					{canEdit
						? `Every change recomputes the budget above. Nothing is stored until you save; the draft stays in this browser.`
						: `You can read this ${subject}; members and captains edit it.`}
				</p>
			</div>
			{!hydrated ? (
				// Some 350 fields: rendered by the browser once it can drive them, not by the server.
				<p role="status" className="text-sm text-ink-soft">
					Loading the part tables…
				</p>
			) : (
				<>
					{EDITOR_ORDER.map((group) => (
						<EditGroup key={group} title={PART_KINDS[group].many} onAdd={add(group)}>
							{addForm(group)}
							<PartTable
								caption={PART_KINDS[group].many}
								rows={partsOf(draft, group) as AnyPart[]}
								columns={cols[group]}
								pathPrefix={group}
								errors={errors}
								readOnly={!canEdit}
								onChange={(i, v) => update(group, i, v)}
								onRemove={canEdit ? (i) => remove(group, i) : undefined}
								rowFlag={(p) => (flagged.has(p.id) ? 'flag' : null)}
								refreshKey={flagged}
							/>
						</EditGroup>
					))}
				</>
			)}
		</section>
	);
}

function EditGroup({
	title,
	onAdd,
	children,
}: {
	title: string;
	onAdd?: () => void;
	children: React.ReactNode;
}) {
	return (
		<div>
			<div className="mb-2 flex items-center gap-3">
				<h4 className="font-semibold">{title}</h4>
				{onAdd && (
					<button
						type="button"
						onClick={onAdd}
						// A held key opens the form once, not again and again.
						onKeyDown={(e) => e.repeat && e.preventDefault()}
						className="rounded-md border border-hairline bg-card px-2 py-0.5 text-sm hover:border-copper"
					>
						+ Add<span className="sr-only"> to {title.toLowerCase()}</span>
					</button>
				)}
			</div>
			{children}
		</div>
	);
}
