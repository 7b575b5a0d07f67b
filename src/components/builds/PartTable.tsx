import { type ColumnDef, flexRender, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { memo, useEffect, useMemo, useState } from 'react';
import { ScrollRegion } from '@/components/ui/ScrollRegion';

export type CellSpec<T> =
	| { kind: 'text'; get: (row: T) => string; set: (row: T, v: string) => T }
	| {
			kind: 'number';
			get: (row: T) => number | null;
			set: (row: T, v: number | null) => T;
			step?: string;
			/** Decimals the value is shown with when it comes from outside (not while typing). */
			digits?: number;
			blankAllowed?: boolean;
	  }
	| {
			kind: 'select';
			get: (row: T) => string;
			set: (row: T, v: string) => T;
			options: Array<{ value: string; label: string }>;
			/** A row where the choice has nothing to apply to (shown dimmed, not editable). */
			inapplicable?: (row: T) => boolean;
	  }
	| { kind: 'checkbox'; get: (row: T) => boolean; set: (row: T, v: boolean) => T };

export interface PartColumn<T> {
	id: string;
	header: string;
	unit?: string;
	/** Path of the field inside the part, for matching validation errors (e.g. `lengthM`). */
	errorPath: string | ((row: T) => string);
	cell: CellSpec<T>;
	width?: string;
}

function NumberInput({
	value,
	onChange,
	label,
	invalid,
	step,
	readOnly,
	digits,
}: {
	value: number | null;
	onChange: (v: number | null) => void;
	label: string;
	invalid: boolean;
	step?: string;
	readOnly: boolean;
	digits?: number;
}) {
	const shown = (v: number | null) =>
		v === null || Number.isNaN(v)
			? ''
			: String(Number(digits === undefined ? v.toPrecision(8) : v.toFixed(digits)));
	const [text, setText] = useState(() => shown(value));
	useEffect(() => {
		const parsed = text.trim() === '' ? null : Number(text);
		if (
			parsed !== value &&
			!(
				parsed !== null &&
				value !== null &&
				Math.abs(parsed - value) < 1e-9 * Math.max(1, Math.abs(value))
			)
		) {
			setText(shown(value));
		}
		// eslint-disable-next-line react-hooks/exhaustive-deps -- follows the value from outside only; the text being typed must not reset it
	}, [value]);
	return (
		<input
			type="text"
			inputMode="decimal"
			aria-label={label}
			aria-invalid={invalid || undefined}
			readOnly={readOnly}
			step={step}
			value={text}
			onChange={(e) => {
				setText(e.target.value);
				const t = e.target.value.trim().replace(',', '.');
				onChange(t === '' ? null : Number(t));
			}}
			className={`num w-full min-w-16 rounded border bg-card px-2 py-1 text-right ${invalid ? 'border-brick' : 'border-hairline'} ${readOnly ? 'bg-paper' : ''}`}
		/>
	);
}

/**
 * One field of one part. A component of its own (never a function made during a render), so
 * React keeps the same input across edits: typing, clearing and retyping keep focus and caret.
 */
export function PartCell<T extends { id: string; label: string }>({
	col,
	part,
	index: i,
	errors,
	pathPrefix,
	readOnly,
	onChange,
	labelPrefix = '',
}: {
	col: PartColumn<T>;
	part: T;
	index: number;
	errors: Record<string, string>;
	pathPrefix: string;
	readOnly: boolean;
	onChange: (index: number, next: T) => void;
	/** Put before the field's accessible name where the same field shows twice (the inspector). */
	labelPrefix?: string;
}) {
	const path = `${pathPrefix}.${i}.${typeof col.errorPath === 'function' ? col.errorPath(part) : col.errorPath}`;
	const error = Object.entries(errors).find(([p]) => p === path || p.startsWith(`${path}.`))?.[1];
	const label = `${labelPrefix}${part.label || part.id}: ${col.header}`;
	const c = col.cell;
	let input: React.ReactNode;
	if (c.kind === 'text') {
		input = (
			<input
				aria-label={label}
				aria-invalid={!!error || undefined}
				readOnly={readOnly}
				value={c.get(part)}
				onChange={(e) => onChange(i, c.set(part, e.target.value))}
				// Sized to what it holds: a part's whole name shows, however long.
				className={`field-sizing-content min-w-28 rounded border bg-card px-2 py-1 ${error ? 'border-brick' : 'border-hairline'} ${readOnly ? 'bg-paper' : ''}`}
			/>
		);
	} else if (c.kind === 'number') {
		input = (
			<NumberInput
				label={label}
				value={c.get(part)}
				onChange={(v) => onChange(i, c.set(part, v))}
				invalid={!!error}
				step={c.step}
				digits={c.digits}
				readOnly={readOnly}
			/>
		);
	} else if (c.kind === 'select') {
		input = (
			<select
				aria-label={label}
				disabled={readOnly || (c.inapplicable?.(part) ?? false)}
				value={c.get(part)}
				onChange={(e) => onChange(i, c.set(part, e.target.value))}
				className={`field-sizing-content min-w-32 rounded border bg-card px-1 py-1 disabled:opacity-40 ${error ? 'border-brick' : 'border-hairline'}`}
			>
				{c.options.map((o) => (
					<option key={o.value} value={o.value}>
						{o.label}
					</option>
				))}
			</select>
		);
	} else {
		input = (
			<input
				type="checkbox"
				aria-label={label}
				disabled={readOnly}
				checked={c.get(part)}
				onChange={(e) => onChange(i, c.set(part, e.target.checked))}
				className="size-4 accent-copper"
			/>
		);
	}
	return (
		<div className="flex flex-col gap-0.5">
			{input}
			{error && (
				<span role="alert" className="max-w-48 text-xs leading-tight text-brick">
					✕ {error}
				</span>
			)}
		</div>
	);
}

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
