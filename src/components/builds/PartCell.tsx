import { useEffect, useState } from 'react';

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
