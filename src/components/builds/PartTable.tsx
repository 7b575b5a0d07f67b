import { type ColumnDef, flexRender, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { memo, useMemo, useState } from 'react';
import { ScrollRegion } from '@/components/ui/ScrollRegion';
import { type PartColumn, PartCell } from './PartCell';

export { PartCell, type CellSpec, type PartColumn } from './PartCell';

/**
 * An editable table of parts (cables, banks, …) on @tanstack/react-table: one row per part, one
 * field per cell, each validation message shown under the field it concerns. Tab moves through
 * the fields in reading order.
 */
export function PartTable<T extends { id: string; label: string }>({
	caption,
	rows,
	columns,
	onChange,
	onRemove,
	errors,
	pathPrefix,
	readOnly,
	rowFlag,
}: {
	caption: string;
	rows: T[];
	columns: PartColumn<T>[];
	onChange: (index: number, next: T) => void;
	onRemove?: (index: number) => void;
	errors: Record<string, string>;
	pathPrefix: string;
	readOnly: boolean;
	rowFlag?: (row: T) => string | null;
	/** Whatever `rowFlag` reads (compared by identity): a change renders the rows' flags again. */
	refreshKey?: unknown;
}) {
	// The same column objects while the columns are, so the table does not rebuild them per edit.
	const defs: ColumnDef<T>[] = useMemo(
		() =>
			columns.map((col) => ({
				id: col.id,
				header: () => (
					<span>
						{col.header}
						{col.unit && <span className="font-normal text-ink-soft"> ({col.unit})</span>}
					</span>
				),
			})),
		[columns],
	);
	const table = useReactTable({
		data: rows,
		columns: defs,
		getCoreRowModel: getCoreRowModel(),
		getRowId: (r) => r.id,
	});
	// A long group (a build at the limits) is paged: a thousand rows of fields would take the
	// browser tens of seconds to lay out. A part just added is on the page shown.
	const pages = Math.max(1, Math.ceil(rows.length / ROWS_PER_PAGE));
	const [view, setView] = useState({ page: 0, count: rows.length });
	let at = Math.min(view.page, pages - 1);
	if (rows.length !== view.count) {
		if (rows.length > view.count) at = pages - 1;
		setView({ page: at, count: rows.length });
	}
	const all = table.getRowModel().rows;
	const shown = pages > 1 ? all.slice(at * ROWS_PER_PAGE, (at + 1) * ROWS_PER_PAGE) : all;
	return (
		<>
			<ScrollRegion label={caption} className="rounded-md border border-hairline bg-card">
				<table className="w-full text-sm" data-part-group={pathPrefix}>
					<caption className="sr-only">{caption}</caption>
					<thead className="border-b border-hairline bg-paper text-left text-xs text-ink-soft">
						{table.getHeaderGroups().map((hg) => (
							<tr key={hg.id}>
								{hg.headers.map((h) => (
									<th key={h.id} scope="col" className="px-2 py-2 font-semibold whitespace-nowrap">
										{flexRender(h.column.columnDef.header, h.getContext())}
									</th>
								))}
								{!readOnly && onRemove && (
									<th className="px-2 py-2">
										<span className="sr-only">Remove</span>
									</th>
								)}
							</tr>
						))}
					</thead>
					<tbody>
						{shown.map((row) => (
							<PartRow
								key={row.id}
								part={row.original}
								index={row.index}
								columns={columns}
								errors={errors}
								errorsKey={rowErrorsKey(errors, `${pathPrefix}.${row.index}.`)}
								pathPrefix={pathPrefix}
								readOnly={readOnly}
								onChange={onChange}
								onRemove={onRemove}
								flag={rowFlag?.(row.original) ?? null}
							/>
						))}
					</tbody>
				</table>
			</ScrollRegion>
			{pages > 1 && (
				<nav
					aria-label={`Pages of ${caption.toLowerCase()}`}
					className="mt-1 flex items-center gap-3 text-sm"
				>
					<button
						type="button"
						disabled={at === 0}
						onClick={() => setView({ page: at - 1, count: rows.length })}
						className="rounded-md border border-hairline bg-card px-2 py-0.5 disabled:opacity-50"
					>
						← Previous
					</button>
					<span aria-live="polite">
						Rows {at * ROWS_PER_PAGE + 1}–{Math.min(rows.length, (at + 1) * ROWS_PER_PAGE)} of{' '}
						{rows.length}
					</span>
					<button
						type="button"
						disabled={at === pages - 1}
						onClick={() => setView({ page: at + 1, count: rows.length })}
						className="rounded-md border border-hairline bg-card px-2 py-0.5 disabled:opacity-50"
					>
						Next →
					</button>
				</nav>
			)}
		</>
	);
}

/** Rows of a part table shown at once; longer groups are paged. */
export const ROWS_PER_PAGE = 50;

/** The errors of one row as text: a row re-renders only when its own errors change. */
function rowErrorsKey(errors: Record<string, string>, prefix: string): string {
	let key = '';
	for (const [p, m] of Object.entries(errors)) if (p.startsWith(prefix)) key += `${p}=${m};`;
	return key;
}

interface PartRowProps<T> {
	part: T;
	index: number;
	columns: PartColumn<T>[];
	errors: Record<string, string>;
	errorsKey: string;
	pathPrefix: string;
	readOnly: boolean;
	onChange: (index: number, next: T) => void;
	onRemove?: (index: number) => void;
	flag: string | null;
}

function PartRowView<T extends { id: string; label: string }>({
	part,
	index,
	columns,
	errors,
	pathPrefix,
	readOnly,
	onChange,
	onRemove,
	flag,
}: PartRowProps<T>) {
	return (
		<tr
			className={`border-b border-hairline align-top last:border-0 ${flag ? 'bg-brick-tint/40' : ''}`}
			data-part-id={part.id}
		>
			{columns.map((col) => (
				<td key={col.id} className="px-2 py-1.5">
					<PartCell
						col={col}
						part={part}
						index={index}
						errors={errors}
						pathPrefix={pathPrefix}
						readOnly={readOnly}
						onChange={onChange}
					/>
				</td>
			))}
			{!readOnly && onRemove && (
				<td className="px-2 py-1.5">
					<button
						type="button"
						onClick={() => onRemove(index)}
						aria-label={`Remove ${part.label || part.id}`}
						className="rounded px-2 py-1 text-ink-soft hover:bg-brick-tint hover:text-brick"
					>
						✕
					</button>
				</td>
			)}
		</tr>
	);
}

/**
 * A row re-renders when its part, place, columns, own errors or flag change — not on every edit
 * elsewhere in the build. The callbacks update the draft through functional updates, so a row
 * kept from an earlier render still writes to the current draft.
 */
const PartRow = memo(
	PartRowView,
	(a, b) =>
		a.part === b.part &&
		a.index === b.index &&
		a.columns === b.columns &&
		a.errorsKey === b.errorsKey &&
		a.readOnly === b.readOnly &&
		a.flag === b.flag &&
		a.pathPrefix === b.pathPrefix &&
		Boolean(a.onRemove) === Boolean(b.onRemove),
) as typeof PartRowView;

/**
 * A part table that renders again only when its own rows, columns, errors or flags change: typing
 * into one cable leaves the bank, alternator, amplifier, load and node tables alone.
 */
export const MemoPartTable = memo(
	PartTable,
	(a, b) =>
		a.rows === b.rows &&
		a.columns === b.columns &&
		a.readOnly === b.readOnly &&
		a.refreshKey === b.refreshKey &&
		a.pathPrefix === b.pathPrefix &&
		Boolean(a.onRemove) === Boolean(b.onRemove) &&
		rowErrorsKey(a.errors, `${a.pathPrefix}.`) === rowErrorsKey(b.errors, `${b.pathPrefix}.`),
) as typeof PartTable;
