import Papa from 'papaparse';
import type * as zm from 'zod/mini';
import { minorToText, parseMoney } from '@/lib/money';
import { SHELF_SPECS, shelfItemSchema, type ShelfItemInput } from '@/lib/schemas/shelf';
import { findControlCharacter, NOTES_MESSAGE } from '@/lib/schemas/text';
import { SHELF_KINDS, SHELF_NAMES, type ShelfItemDto, type ShelfKind } from '@/lib/shelf-kinds';
import type { FieldError } from './http';

/**
 * The shelf as CSV: one row an entry; the columns every entry has (kind, name, price, supplier,
 * link, owned, notes), then one column per field of the kinds present, nested fields by a dotted
 * name (`size.awg`), lists as JSON. A price is text with two decimals, exact. Cells that a
 * spreadsheet would run as a formula go out with a leading apostrophe and come back without it.
 */
const FIXED = ['kind', 'name', 'price', 'supplier', 'link', 'owned', 'notes'] as const;
/** A field of a part named like a column every entry has (a relay's `kind`) goes by `spec.kind`. */
const SPEC_PREFIX = 'spec.';
const columnOf = (key: string) =>
	(FIXED as readonly string[]).includes(key.split('.')[0]!) ? `${SPEC_PREFIX}${key}` : key;
const keyOf = (column: string) =>
	column.startsWith(SPEC_PREFIX) ? column.slice(SPEC_PREFIX.length) : column;

function flatten(value: Record<string, unknown>, prefix = '', into: Record<string, string> = {}) {
	for (const [k, v] of Object.entries(value)) {
		const key = prefix ? `${prefix}.${k}` : k;
		if (v !== null && typeof v === 'object' && !Array.isArray(v))
			flatten(v as Record<string, unknown>, key, into);
		else into[key] = v === null ? '' : Array.isArray(v) ? JSON.stringify(v) : String(v);
	}
	return into;
}

export function shelfToCsv(items: ShelfItemDto[]): string {
	const specColumns: string[] = [];
	const rows = items.map((item) => {
		const spec = Object.fromEntries(
			Object.entries(flatten(item.spec)).map(([k, v]) => [columnOf(k), v]),
		);
		for (const key of Object.keys(spec)) if (!specColumns.includes(key)) specColumns.push(key);
		return {
			kind: item.kind,
			name: item.label,
			price: item.priceMinor === null ? '' : minorToText(item.priceMinor),
			supplier: item.supplier,
			link: item.link,
			owned: String(item.owned),
			notes: item.notes,
			...spec,
		};
	});
	return Papa.unparse(rows, { columns: [...FIXED, ...specColumns], escapeFormulae: true });
}

type Def = {
	type: string;
	innerType?: Schema;
	shape?: Record<string, Schema>;
	options?: Schema[];
	discriminator?: string;
	values?: unknown[];
};
type Schema = zm.core.SomeType & { _zod: { def: Def } };

/** Reads a cell's text as the schema's field wants it; what cannot be read stays text for the schema to name. */
function coerce(schema: Schema | undefined, raw: unknown): unknown {
	if (!schema || raw === undefined) return raw;
	const def = schema._zod.def;
	switch (def.type) {
		case 'optional':
			return raw === '' ? undefined : coerce(def.innerType, raw);
		case 'nullable':
			return raw === '' ? null : coerce(def.innerType, raw);
		case 'number':
			return typeof raw === 'string' && /^\s*-?\d+(\.\d+)?([eE][-+]?\d+)?\s*$/.test(raw)
				? Number(raw)
				: raw;
		case 'boolean':
			if (typeof raw !== 'string') return raw;
			if (/^(true|yes|1)$/i.test(raw.trim())) return true;
			if (/^(false|no|0)$/i.test(raw.trim())) return false;
			return raw;
		case 'array':
			if (typeof raw !== 'string') return raw;
			try {
				return JSON.parse(raw);
			} catch {
				return raw;
			}
		case 'object': {
			if (raw === null || typeof raw !== 'object') return raw;
			const out: Record<string, unknown> = {};
			for (const [k, v] of Object.entries(raw as Record<string, unknown>)) {
				const c = coerce(def.shape?.[k], v);
				if (c !== undefined) out[k] = c;
			}
			return out;
		}
		case 'union': {
			if (raw === null || typeof raw !== 'object') return raw;
			const tag = def.discriminator ? (raw as Record<string, unknown>)[def.discriminator] : null;
			const option =
				def.options?.find(
					(o) =>
						def.discriminator &&
						o._zod.def.shape?.[def.discriminator]?._zod.def.values?.includes(tag),
				) ?? def.options?.[0];
			return coerce(option, raw);
		}
		default:
			return raw;
	}
}

/** Undoes the apostrophe a formula-looking cell was sent out with. */
const unescape = (cell: string) => (/^'[=+\-@\t\r]/.test(cell) ? cell.slice(1) : cell);

/** A column name's parts that could reach an object's prototype: never a field of ours. */
const UNSAFE_KEY = /^(__proto__|constructor|prototype)$/;
export const isSafeColumn = (key: string) =>
	key.split('.').every((p) => p !== '' && !UNSAFE_KEY.test(p));

/** Dotted column names as nested objects, own properties only. */
function nest(cells: Array<[string, string]>): Record<string, unknown> {
	const out: Record<string, unknown> = {};
	for (const [key, value] of cells) {
		const parts = key.split('.');
		let at = out;
		for (const p of parts.slice(0, -1)) {
			const next = Object.hasOwn(at, p) ? at[p] : undefined;
			if (typeof next !== 'object' || next === null) at[p] = {};
			at = at[p] as Record<string, unknown>;
		}
		at[parts.at(-1)!] = value;
	}
	return out;
}

export type ShelfCsvResult =
	{ ok: true; items: ShelfItemInput[] } | { ok: false; errors: FieldError[] };

/**
 * Reads a shelf CSV. Every row is checked as an entry would be; any row in error names the row
 * (as the spreadsheet numbers it, the header being row 1) and the column, and nothing is taken.
 */
export function parseShelfCsv(text: string, limit: number): ShelfCsvResult {
	const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), {
		header: true,
		skipEmptyLines: 'greedy',
		transformHeader: (h) => h.trim(),
	});
	const errors: FieldError[] = [];
	const header = parsed.meta.fields ?? [];
	for (const f of ['kind', 'name'])
		if (!header.includes(f))
			errors.push({ path: 'header', message: `The first row needs a "${f}" column` });
	if (errors.length) return { ok: false, errors };
	if (parsed.data.length === 0)
		return { ok: false, errors: [{ path: 'rows', message: 'The file has no entries' }] };
	if (parsed.data.length > limit)
		return {
			ok: false,
			errors: [{ path: 'rows', message: `At most ${limit} entries a shelf` }],
		};
	const items: ShelfItemInput[] = [];
	parsed.data.forEach((row, i) => {
		const line = i + 2;
		const where = (path: string) => `rows.${line}${path ? `.${path}` : ''}`;
		const cell = (k: string) => unescape((row[k] ?? '').trim());
		const kind = cell('kind') as ShelfKind;
		if (!SHELF_KINDS.includes(kind)) {
			errors.push({
				path: where('kind'),
				message: `Row ${line}: kind is one of ${SHELF_KINDS.join(', ')}`,
			});
			return;
		}
		const specSchema = SHELF_SPECS[kind] as unknown as Schema;
		const fields = new Set(Object.keys(specSchema._zod.def.shape ?? {}));
		const cells: Array<[string, string]> = [];
		for (const column of header) {
			if ((FIXED as readonly string[]).includes(column) || column === '__parsed_extra') continue;
			const key = keyOf(column);
			const value = cell(column);
			if (!isSafeColumn(key)) {
				errors.push({
					path: where('header'),
					message: `Row ${line}: no field is called "${column}"`,
				});
				continue;
			}
			if (value === '' && !fields.has(key.split('.')[0]!)) continue;
			if (!fields.has(key.split('.')[0]!)) {
				errors.push({
					path: where(column),
					message: `Row ${line}: ${SHELF_NAMES[kind]} has no "${column}"`,
				});
				continue;
			}
			cells.push([key, value]);
		}
		const priceText = cell('price');
		const priceMinor = priceText === '' ? null : parseMoney(priceText);
		if (priceText !== '' && priceMinor === null)
			errors.push({
				path: where('price'),
				message: `Row ${line}: price is a number with at most two decimals, e.g. 129.95`,
			});
		const ownedText = cell('owned');
		const candidate = {
			kind,
			label: cell('name'),
			spec: coerce(specSchema, nest(cells)),
			priceMinor,
			supplier: cell('supplier'),
			link: cell('link'),
			owned: ownedText === '' ? 0 : /^\d+$/.test(ownedText) ? Number(ownedText) : ownedText,
			notes: (row.notes ?? '').trim(),
		};
		const result = shelfItemSchema.safeParse(candidate);
		if (!result.success) {
			for (const issue of result.error.issues) {
				const path = issue.path.map(String);
				const column =
					path[0] === 'spec'
						? columnOf(path.slice(1).join('.'))
						: path[0] === 'label'
							? 'name'
							: path[0];
				errors.push({
					path: where(column ?? ''),
					message: `Row ${line}${column ? `, ${column}` : ''}: ${issue.message}`,
				});
			}
			return;
		}
		const bad = findControlCharacter(result.data);
		if (bad !== null) {
			errors.push({ path: where(bad), message: `Row ${line}: ${NOTES_MESSAGE}` });
			return;
		}
		items.push(result.data);
	});
	return errors.length ? { ok: false, errors: errors.slice(0, 200) } : { ok: true, items };
}
