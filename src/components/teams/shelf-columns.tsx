import { PROTECTION_DEVICES, type BuildDocument, type UnitSystem } from '@/engine/browser';
import { UI_PART_KINDS } from '@/components/builds/part-kinds';
import type { PartColumn } from '@/components/builds/PartTable';
import { num } from '@/components/builds/column-kit';
import {
	PLACEMENT_FIELDS,
	priceUnit,
	SHELF_GROUP,
	shelfSpecOf,
	type ShelfItemDto,
	type ShelfKind,
} from '@/lib/shelf-kinds';
import { minorToText } from '@/lib/money';

/**
 * A shelf entry as a table row: the part's own fields at the top level (so the build's part
 * columns edit them), and what the team knows of it beside, as typed.
 */
export interface ShelfRow {
	id: string;
	label: string;
	/** Saved, or made here and not yet saved. */
	saved: boolean;
	updatedAt: string;
	shelf: { price: string; supplier: string; link: string; owned: string; notes: string };
	[field: string]: unknown;
}

const EMPTY: BuildDocument = {
	schemaVersion: 1,
	nodes: [],
	alternators: [],
	banks: [],
	amplifiers: [],
	loads: [],
	cables: [],
};

/** A new entry's fields: the build's defaults for a new part of the kind. */
export function newSpec(kind: ShelfKind): Record<string, unknown> {
	const group = SHELF_GROUP[kind];
	if (!group) return { ratingA: 150, device: 'fuse', contactResistanceOhm: 0.0002 };
	return shelfSpecOf(kind, UI_PART_KINDS[group].make(EMPTY));
}

export const toRow = (x: ShelfItemDto): ShelfRow => ({
	...x.spec,
	id: x.id,
	label: x.label,
	saved: true,
	updatedAt: x.updatedAt,
	shelf: {
		price: x.priceMinor === null ? '' : minorToText(x.priceMinor),
		supplier: x.supplier,
		link: x.link,
		owned: String(x.owned),
		notes: x.notes,
	},
});

/** The part's own fields of a row, as the kind's entry holds them. */
export function specOfRow(kind: ShelfKind, row: ShelfRow): Record<string, unknown> {
	const keys = Object.keys(newSpec(kind));
	return Object.fromEntries(keys.filter((k) => k in row).map((k) => [k, row[k]]));
}

const text = (
	key: keyof ShelfRow['shelf'],
	header: string,
	errorPath: string,
	unit?: string,
): PartColumn<ShelfRow> => ({
	id: `shelf-${key}`,
	header,
	unit,
	errorPath,
	cell: {
		kind: 'text',
		get: (r) => r.shelf[key],
		set: (r, v) => ({ ...r, shelf: { ...r.shelf, [key]: v } }),
	},
});

const FUSE_COLUMNS: PartColumn<ShelfRow>[] = [
	{
		id: 'ratingA',
		header: 'Rating',
		unit: 'A',
		errorPath: 'ratingA',
		cell: {
			kind: 'number',
			get: (r) => r.ratingA as number,
			set: (r, v) => ({ ...r, ratingA: num(v) }),
		},
	},
	{
		id: 'device',
		header: 'Kind',
		errorPath: 'device',
		cell: {
			kind: 'select',
			get: (r) => (r.device as string) ?? 'fuse',
			set: (r, v) => ({ ...r, device: v }),
			options: PROTECTION_DEVICES.map((d) => ({ value: d, label: d })),
		},
	},
	{
		id: 'contactResistanceOhm',
		header: 'Holder',
		unit: 'mΩ',
		errorPath: 'contactResistanceOhm',
		cell: {
			kind: 'number',
			get: (r) =>
				typeof r.contactResistanceOhm === 'number' ? r.contactResistanceOhm * 1000 : null,
			set: (r, v) => ({ ...r, contactResistanceOhm: v === null ? undefined : v / 1000 }),
			blankAllowed: true,
		},
	},
];

/**
 * The columns of a kind's shelf table: its name, the build's own columns for the fields a shelf
 * entry keeps (not the ends, counts or length its place in a build supplies), then price,
 * supplier, link, how many the team has and notes.
 */
export function shelfColumns(kind: ShelfKind, units: UnitSystem): PartColumn<ShelfRow>[] {
	const group = SHELF_GROUP[kind];
	const keep = new Set(['label', ...Object.keys(newSpec(kind))]);
	const placed = new Set(PLACEMENT_FIELDS[kind]);
	const own = group
		? (UI_PART_KINDS[group].columns([], units) as unknown as PartColumn<ShelfRow>[]).filter(
				(c) =>
					typeof c.errorPath === 'string' &&
					keep.has(c.errorPath.split('.')[0]!) &&
					!placed.has(c.errorPath.split('.')[0]!),
			)
		: [
				{
					id: 'label',
					header: 'Name',
					errorPath: 'label',
					cell: {
						kind: 'text' as const,
						get: (r: ShelfRow) => r.label,
						set: (r: ShelfRow, v: string) => ({ ...r, label: v }),
					},
				},
				...FUSE_COLUMNS,
			];
	return [
		...own,
		text('price', 'Price', 'priceMinor', priceUnit(kind)),
		text('owned', 'Have', 'owned'),
		text('supplier', 'Supplier', 'supplier'),
		text('link', 'Link or reference', 'link'),
		text('notes', 'Notes', 'notes'),
	];
}
