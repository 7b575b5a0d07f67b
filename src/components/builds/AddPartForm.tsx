import { useContext, useId, useState } from 'react';
import {
	NODE_KINDS,
	PART_KINDS,
	partsOf,
	type BuildDocument,
	type BuildNode,
	type Cable,
	type NodeKind,
	type PartGroup,
} from '@/engine/browser';
import { GROUP_NAMES } from '@/lib/format';
import { Button, Field } from '@/components/ui/Field';
import { freshId, newCable, newNode } from './new-parts';
import { NEW_NODE as NEW, UI_PART_KINDS } from './part-kinds';
import { ShelfContext, ShelfPicker } from './shelf-context';
import type { ShelfItemDto } from '@/lib/shelf-kinds';

const byKind = (d: BuildDocument, kind: NodeKind) => d.nodes.find((n) => n.kind === kind)?.id;

/**
 * Adds a part by asking where it goes: its name and the node at each terminal, with suggestions
 * (a new amplifier gets terminals of its own, and its feed and ground cables if the member wants
 * them), so nothing is wired silently to another part's terminals.
 */
export function AddPartForm({
	group,
	draft,
	onAdd,
	onCancel,
}: {
	group: PartGroup;
	draft: BuildDocument;
	onAdd: (change: (d: BuildDocument) => BuildDocument) => void;
	onCancel: () => void;
}) {
	const id = useId();
	const noun = GROUP_NAMES[group].toLowerCase();
	const [label, setLabel] = useState(
		() => `${GROUP_NAMES[group]} ${partsOf(draft, group).length + 1}`,
	);
	const [kind, setKind] = useState<NodeKind>('block');
	const kindUi = UI_PART_KINDS[group];
	const [ends, setEnds] = useState<Record<string, string>>(() => kindUi.suggest(draft));
	const [wire, setWire] = useState(group === 'amplifiers');
	const [feedFrom, setFeedFrom] = useState(
		() => byKind(draft, 'block') ?? byKind(draft, 'battery') ?? draft.nodes[0]?.id ?? '',
	);
	const [error, setError] = useState<string | undefined>();
	const shelf = useContext(ShelfContext);
	const [picked, setPicked] = useState<ShelfItemDto | null>(null);

	function submit(e: React.FormEvent) {
		e.preventDefault();
		const name = label.trim();
		if (!name) return setError(`Name the ${noun}`);
		if (kindUi.ends.length === 2) {
			const [a, b] = kindUi.ends.map((t) => ends[t.key]);
			if (a !== NEW && a === b) return setError('The two ends must be different nodes');
		}
		onAdd((d) => {
			if (group === 'nodes')
				return { ...d, nodes: [...d.nodes, { ...newNode(d), label: name, kind }] };
			const nodes: BuildNode[] = [...d.nodes];
			const at: Record<string, string> = {};
			for (const t of kindUi.ends) {
				if (ends[t.key] !== NEW) {
					at[t.key] = ends[t.key]!;
					continue;
				}
				const sign = t.key === 'negative' || t.key === 'to' ? '−' : '+';
				const node: BuildNode = {
					id: freshId({ ...d, nodes }, 'node'),
					label: PART_KINDS[group].ends === 'link' ? `${name} end` : `${name} ${sign}`,
					kind: t.key === 'negative' && group !== 'amplifiers' ? 'block' : kindUi.newNodeKind,
				};
				nodes.push(node);
				at[t.key] = node.id;
			}
			const withNodes = { ...d, nodes };
			// A shelf entry's fields over the kind's defaults; its place (ends, length) from the build.
			const part = { ...kindUi.make(withNodes), ...(picked?.spec ?? {}), label: name, ...at };
			if (picked) shelf?.onPick?.(picked, part);
			const next = {
				...withNodes,
				[group]: [...partsOf(withNodes, group), part],
			} as BuildDocument;
			if (group !== 'amplifiers' || !wire) return next;
			const chassis = byKind(next, 'chassis');
			const extra: Cable[] = [];
			if (feedFrom && feedFrom !== at.positive)
				extra.push({
					...newCable(next),
					id: freshId(next, 'cable'),
					label: `${name} feed`,
					from: feedFrom,
					to: at.positive!,
				});
			const withFeed = { ...next, cables: [...next.cables, ...extra] };
			if (chassis && chassis !== at.negative)
				withFeed.cables.push({
					...newCable(withFeed),
					id: freshId(withFeed, 'cable'),
					label: `${name} ground`,
					from: at.negative!,
					to: chassis,
				});
			return withFeed;
		});
	}

	const nodeSelect = (key: string, label: string, allowNew = true) => (
		<div key={key} className="flex min-w-0 flex-col gap-1">
			<label htmlFor={`${id}-${key}`} className="text-sm font-semibold">
				{label}
			</label>
			<select
				id={`${id}-${key}`}
				value={ends[key] ?? ''}
				onChange={(e) => setEnds((x) => ({ ...x, [key]: e.target.value }))}
				className="w-full min-w-0 rounded-md border border-hairline bg-card px-3 py-2"
			>
				{allowNew && <option value={NEW}>A new node for it</option>}
				{draft.nodes.map((n) => (
					<option key={n.id} value={n.id}>
						{n.label || n.id}
					</option>
				))}
			</select>
		</div>
	);

	return (
		<form
			onSubmit={submit}
			aria-label={`Add ${/^[aeiou]/.test(noun) ? 'an' : 'a'} ${noun}`}
			className="mb-3 flex flex-col gap-3 rounded-md border border-copper/50 bg-copper-tint/30 p-3"
		>
			{shelf && group !== 'nodes' && (
				<ShelfPicker
					id={`${id}-shelf`}
					teamId={shelf.teamId}
					group={group}
					noun={noun}
					picked={picked}
					onPicked={(entry) => {
						setPicked(entry);
						if (entry) setLabel(entry.label);
					}}
					carriesPrice={shelf.onPick !== undefined}
				/>
			)}
			<div className="grid grid-cols-1 gap-3 sm:grid-cols-3">
				<Field
					label="Name"
					value={label}
					onChange={(e) => {
						setLabel(e.target.value);
						setError(undefined);
					}}
					error={error}
					autoFocus
				/>
				{group === 'nodes' ? (
					<div className="flex min-w-0 flex-col gap-1">
						<label htmlFor={`${id}-kind`} className="text-sm font-semibold">
							Kind
						</label>
						<select
							id={`${id}-kind`}
							value={kind}
							onChange={(e) => setKind(e.target.value as NodeKind)}
							className="w-full rounded-md border border-hairline bg-card px-3 py-2"
						>
							{NODE_KINDS.map((k) => (
								<option key={k} value={k}>
									{k}
								</option>
							))}
						</select>
					</div>
				) : (
					kindUi.ends.map((t) => nodeSelect(t.key, t.label))
				)}
			</div>
			{group === 'amplifiers' && (
				<div className="flex flex-wrap items-end gap-3 text-sm">
					<label className="flex items-center gap-2">
						<input type="checkbox" checked={wire} onChange={(e) => setWire(e.target.checked)} />
						Also add its feed cable from
					</label>
					<select
						aria-label="Feed the amplifier from"
						value={feedFrom}
						disabled={!wire}
						onChange={(e) => setFeedFrom(e.target.value)}
						className="min-w-0 rounded-md border border-hairline bg-card px-2 py-1"
					>
						{draft.nodes.map((n) => (
							<option key={n.id} value={n.id}>
								{n.label || n.id}
							</option>
						))}
					</select>
					<span className="text-ink-soft">
						and its ground to the chassis (set gauge and length in the cables)
					</span>
				</div>
			)}
			<div className="flex flex-wrap gap-2">
				<Button type="submit">Add the {noun}</Button>
				<Button type="button" variant="secondary" onClick={onCancel}>
					Cancel
				</Button>
			</div>
		</form>
	);
}
