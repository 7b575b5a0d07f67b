import { useEffect, useMemo, useRef, useState } from 'react';
import type { UnitSystem } from '@/engine/browser';
import { MemoPartTable as PartTable } from '@/components/builds/PartTable';
import { Button } from '@/components/ui/Field';
import { ApiError } from '@/lib/client/api-client';
import { withQueryClient } from '@/lib/client/query-client';
import {
	fetchShelf,
	useImportShelf,
	useRemoveShelfItem,
	useSaveShelfItem,
} from '@/lib/client/queries/shelf';
import { formatMoney } from '@/lib/format';
import { parseMoney } from '@/lib/money';
import { SHELF_KINDS, SHELF_NAMES, type ShelfItemDto, type ShelfKind } from '@/lib/shelf-kinds';
import { PART_KINDS } from '@/engine/browser';
import { newSpec, shelfColumns, specOfRow, toRow, type ShelfRow } from './shelf-columns';

const TITLES: Record<ShelfKind, string> = {
	...(Object.fromEntries(
		SHELF_KINDS.filter((k) => k !== 'fuses').map((k) => [
			k,
			PART_KINDS[k as Exclude<ShelfKind, 'fuses'>].many,
		]),
	) as Record<ShelfKind, string>),
	fuses: 'Fuses and breakers',
};

type Rows = Record<ShelfKind, ShelfRow[]>;

const group = (items: ShelfItemDto[]): Rows => {
	const out = Object.fromEntries(SHELF_KINDS.map((k) => [k, [] as ShelfRow[]])) as Rows;
	for (const x of items) out[x.kind]?.push(toRow(x));
	return out;
};

/** A field error of the API (`spec.unitCapacityAh`) as the table's key (`banks.2.unitCapacityAh`). */
const tableKey = (kind: ShelfKind, index: number, path: string) =>
	`${kind}.${index}.${path.startsWith('spec.') ? path.slice(5) : path}`;

/**
 * The team's parts shelf: a table per kind with the build's own columns for each part's fields,
 * and price, how many the team has, supplier, link and notes. Edits are kept on the page until
 * "Save changes" (the page warns before leaving with unsaved ones); a row the server refuses
 * keeps what was typed and shows why under the field.
 */
export const ShelfBoard = withQueryClient(function ShelfBoard({
	teamId,
	canEdit,
	currency,
	units,
	initial,
}: {
	teamId: string;
	canEdit: boolean;
	currency: string;
	units: UnitSystem;
	initial: ShelfItemDto[];
}) {
	const [rows, setRows] = useState<Rows>(() => group(initial));
	const [dirty, setDirty] = useState<Set<string>>(new Set());
	const [errors, setErrors] = useState<Record<string, string>>({});
	const [status, setStatus] = useState<string | null>(null);
	const [busy, setBusy] = useState(false);
	const [addKind, setAddKind] = useState<ShelfKind>('banks');
	const [focusId, setFocusId] = useState<string | null>(null);
	const [importErrors, setImportErrors] = useState<string[]>([]);
	const fileRef = useRef<HTMLInputElement>(null);
	const saveItem = useSaveShelfItem(teamId);
	const removeItem = useRemoveShelfItem(teamId);
	const importShelf = useImportShelf(teamId);
	const columns = useMemo(
		() =>
			Object.fromEntries(SHELF_KINDS.map((k) => [k, shelfColumns(k, units)])) as Record<
				ShelfKind,
				ReturnType<typeof shelfColumns>
			>,
		[units],
	);

	useEffect(() => {
		if (dirty.size === 0) return;
		const warn = (e: BeforeUnloadEvent) => e.preventDefault();
		addEventListener('beforeunload', warn);
		return () => removeEventListener('beforeunload', warn);
	}, [dirty]);

	useEffect(() => {
		if (!focusId) return;
		document
			.querySelector<HTMLElement>(
				`tr[data-part-id="${focusId}"] input, tr[data-part-id="${focusId}"] select`,
			)
			?.focus();
		setFocusId(null);
	}, [focusId, rows]);

	function change(kind: ShelfKind, index: number, next: ShelfRow) {
		setRows((r) => ({ ...r, [kind]: r[kind].map((x, i) => (i === index ? next : x)) }));
		setDirty((d) => new Set(d).add(next.id));
		setStatus(null);
	}

	function add() {
		const id = `new-${crypto.randomUUID()}`;
		const row: ShelfRow = {
			...newSpec(addKind),
			id,
			label: `New ${SHELF_NAMES[addKind].replace(/^an? /, '')}`,
			saved: false,
			updatedAt: '',
			shelf: { price: '', supplier: '', link: '', owned: '0', notes: '' },
		};
		setRows((r) => ({ ...r, [addKind]: [...r[addKind], row] }));
		setDirty((d) => new Set(d).add(id));
		setFocusId(id);
	}

	async function remove(kind: ShelfKind, index: number) {
		const row = rows[kind][index]!;
		if (row.saved) {
			try {
				await removeItem.mutateAsync(row.id);
			} catch (error) {
				if (!(error instanceof ApiError && error.status === 404)) {
					setStatus(error instanceof Error ? error.message : 'Could not remove it.');
					return;
				}
			}
		}
		setRows((r) => ({ ...r, [kind]: r[kind].filter((_, i) => i !== index) }));
		setDirty((d) => {
			const next = new Set(d);
			next.delete(row.id);
			return next;
		});
		setErrors({});
		setStatus(`Removed “${row.label}”.`);
	}

	async function save() {
		setBusy(true);
		setStatus(null);
		const nextErrors: Record<string, string> = {};
		let saved = 0;
		let next = rows;
		const stillDirty = new Set(dirty);
		for (const kind of SHELF_KINDS) {
			for (const [index, row] of rows[kind].entries()) {
				if (!dirty.has(row.id)) continue;
				const priceMinor = row.shelf.price.trim() === '' ? null : parseMoney(row.shelf.price);
				const owned = /^\s*\d+\s*$/.test(row.shelf.owned) ? Number(row.shelf.owned) : NaN;
				if (row.shelf.price.trim() !== '' && priceMinor === null)
					nextErrors[tableKey(kind, index, 'priceMinor')] =
						'A price is a number with at most two decimals, e.g. 129.95';
				if (Number.isNaN(owned))
					nextErrors[tableKey(kind, index, 'owned')] = 'How many is a whole number';
				if (Number.isNaN(owned) || (row.shelf.price.trim() !== '' && priceMinor === null)) continue;
				const item = {
					kind,
					label: row.label,
					spec: specOfRow(kind, row),
					priceMinor,
					supplier: row.shelf.supplier,
					link: row.shelf.link,
					owned,
					notes: row.shelf.notes,
				};
				try {
					const answer = await saveItem.mutateAsync(
						row.saved ? { id: row.id, updatedAt: row.updatedAt, item } : { item },
					);
					next = { ...next, [kind]: next[kind].map((x) => (x.id === row.id ? toRow(answer) : x)) };
					stillDirty.delete(row.id);
					saved++;
				} catch (error) {
					if (error instanceof ApiError && error.status === 409 && error.body.current) {
						const current = error.body.current as ShelfItemDto;
						next = {
							...next,
							[kind]: next[kind].map((x) => (x.id === row.id ? toRow(current) : x)),
						};
						stillDirty.delete(row.id);
						nextErrors[tableKey(kind, index, 'label')] =
							'Someone saved this entry since you opened it: theirs is shown; make your change again';
					} else if (error instanceof ApiError && error.fieldErrors.length) {
						for (const e of error.fieldErrors)
							nextErrors[tableKey(kind, index, e.path)] = e.message;
					} else {
						nextErrors[tableKey(kind, index, 'label')] =
							error instanceof Error ? error.message : 'Could not save it';
					}
				}
			}
		}
		setRows(next);
		setDirty(stillDirty);
		setErrors(nextErrors);
		setBusy(false);
		const left = Object.keys(nextErrors).length;
		setStatus(
			left
				? `Saved ${saved}; ${stillDirty.size} still need attention (see the marked fields).`
				: `Saved ${saved} ${saved === 1 ? 'entry' : 'entries'}.`,
		);
	}

	async function importFile(file: File) {
		setImportErrors([]);
		setStatus(null);
		try {
			const { ok, body } = await importShelf.mutateAsync(file);
			if (!ok) {
				setImportErrors([
					body.detail ?? 'The file was refused',
					...(body.errors ?? []).map((e) => e.message),
				]);
				return;
			}
			const items = await fetchShelf(teamId);
			// Unsaved rows stay as typed; the saved ones come back with the file's entries.
			setRows((r) => {
				const fresh = group(items);
				for (const k of SHELF_KINDS) fresh[k].push(...r[k].filter((x) => !x.saved));
				return fresh;
			});
			setStatus(`Added ${body.added} ${body.added === 1 ? 'entry' : 'entries'} from ${file.name}.`);
		} catch {
			setImportErrors(['Could not reach the server. Check the connection and try again.']);
		} finally {
			if (fileRef.current) fileRef.current.value = '';
		}
	}

	const total = SHELF_KINDS.reduce((n, k) => n + rows[k].length, 0);
	const worth = SHELF_KINDS.reduce(
		(sum, k) =>
			sum +
			rows[k].reduce((s, r) => {
				const p = r.saved ? parseMoney(r.shelf.price) : null;
				return k === 'cables' || p === null ? s : s + p * Number(r.shelf.owned || 0);
			}, 0),
		0,
	);
	return (
		<div className="flex flex-col gap-6">
			<div className="flex flex-wrap items-end gap-3">
				<p className="text-sm text-ink-soft">
					{total} {total === 1 ? 'entry' : 'entries'} · what the team has (cables aside) at shelf
					prices:{' '}
					<span className="font-semibold text-ink">{formatMoney(worth / 100, currency)}</span>
				</p>
				<a
					href={`/api/teams/${teamId}/shelf/export.csv`}
					download
					className="rounded-md border border-hairline bg-card px-3 py-1.5 text-sm font-semibold hover:border-copper"
				>
					Download as CSV
				</a>
				{canEdit && (
					<label className="cursor-pointer rounded-md border border-hairline bg-card px-3 py-1.5 text-sm font-semibold hover:border-copper focus-within:outline-2 focus-within:outline-copper">
						Add entries from a CSV file
						<input
							ref={fileRef}
							type="file"
							accept=".csv,text/csv"
							className="sr-only"
							onChange={(e) => {
								const f = e.target.files?.[0];
								if (f) void importFile(f);
							}}
						/>
					</label>
				)}
			</div>
			{importErrors.length > 0 && (
				<div
					role="alert"
					className="rounded-md border border-brick/40 bg-brick-tint/50 p-3 text-sm"
				>
					<p className="font-semibold">{importErrors[0]}</p>
					<ul className="mt-1 list-disc pl-5">
						{importErrors.slice(1, 21).map((m) => (
							<li key={m}>{m}</li>
						))}
					</ul>
					{importErrors.length > 21 && <p>… and {importErrors.length - 21} more.</p>}
				</div>
			)}
			{canEdit && (
				<div className="sticky top-0 z-10 flex flex-wrap items-center gap-2 border-b border-hairline bg-paper py-2">
					<label className="text-sm font-semibold" htmlFor="shelf-add-kind">
						Add to the shelf
					</label>
					<select
						id="shelf-add-kind"
						value={addKind}
						onChange={(e) => setAddKind(e.target.value as ShelfKind)}
						className="rounded-md border border-hairline bg-card px-2 py-1.5 text-sm"
					>
						{SHELF_KINDS.map((k) => (
							<option key={k} value={k}>
								{SHELF_NAMES[k]}
							</option>
						))}
					</select>
					<Button
						type="button"
						variant="secondary"
						onClick={add}
						onKeyDown={(e) => e.repeat && e.preventDefault()}
					>
						Add
					</Button>
					<Button type="button" onClick={save} busy={busy} disabled={busy || dirty.size === 0}>
						Save changes{dirty.size ? ` (${dirty.size})` : ''}
					</Button>
					<span role="status" className="text-sm text-ink-soft">
						{status}
					</span>
				</div>
			)}
			{total === 0 && (
				<p className="rounded-md border border-dashed border-hairline bg-card p-4 text-sm text-ink-soft">
					Nothing on the shelf yet.{' '}
					{canEdit
						? 'Add what the team owns or is eyeing, with its price, and a build or a plan can start a part from it.'
						: 'Members and captains add parts here.'}
				</p>
			)}
			{SHELF_KINDS.filter((k) => rows[k].length > 0).map((kind) => (
				<section key={kind} aria-labelledby={`shelf-${kind}`}>
					<h2 id={`shelf-${kind}`} className="mb-2 text-lg font-bold">
						{TITLES[kind]}{' '}
						<span className="text-sm font-normal text-ink-soft">({rows[kind].length})</span>
					</h2>
					<PartTable
						caption={TITLES[kind]}
						rows={rows[kind]}
						columns={columns[kind]}
						pathPrefix={kind}
						errors={errors}
						readOnly={!canEdit}
						onChange={(i, v) => change(kind, i, v)}
						onRemove={canEdit ? (i) => void remove(kind, i) : undefined}
					/>
				</section>
			))}
		</div>
	);
});
