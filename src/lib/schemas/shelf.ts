import * as zm from 'zod/mini';
import { z } from '@/lib/zod';
import {
	alternatorSchema,
	amplifierSchema,
	batteryBankSchema,
	cableSchema,
	capacitorBankSchema,
	dcDcChargerSchema,
	fuseSchema,
	isolatorSchema,
	steadyLoadSchema,
} from '@/engine';
import { MAX_MINOR } from '@/lib/money';
import { PLACEMENT_FIELDS, SHELF_KINDS, type ShelfKind } from '@/lib/shelf-kinds';
import { lineText, notesText } from './text';

const ENDS = ['id', 'label', 'positive', 'negative'];
const LINK = ['id', 'label', 'from', 'to'];
type SpecSchema = zm.ZodMiniType<Record<string, unknown>>;

/** The kind's part schema without its place's fields, refusing any field of its own. */
function specOf(
	kind: ShelfKind,
	part: { shape: Record<string, zm.core.SomeType> },
	place: string[],
) {
	const left = new Set([...place, ...PLACEMENT_FIELDS[kind]]);
	return zm.strictObject(
		Object.fromEntries(Object.entries(part.shape).filter(([k]) => !left.has(k))),
	) as unknown as SpecSchema;
}

/**
 * What a shelf entry of each kind holds: the engine's own schema of that part without the fields
 * its place in a build supplies, so an entry placed in a build passes the build's checks.
 */
export const SHELF_SPECS: Record<ShelfKind, SpecSchema> = {
	banks: specOf('banks', batteryBankSchema, ENDS),
	alternators: specOf('alternators', alternatorSchema, ENDS),
	amplifiers: specOf('amplifiers', amplifierSchema, ENDS),
	cables: specOf('cables', cableSchema, LINK),
	fuses: specOf('fuses', fuseSchema, []),
	loads: specOf('loads', steadyLoadSchema, ENDS),
	isolators: specOf('isolators', isolatorSchema, LINK),
	capacitors: specOf('capacitors', capacitorBankSchema, ENDS),
	chargers: specOf('chargers', dcDcChargerSchema, LINK),
};

const common = {
	label: lineText(80, { required: 'Give it a name', maxMessage: 'Keep names to 80 characters' }),
	priceMinor: z
		.number({ error: 'Price is a whole number of cents' })
		.int('Price is a whole number of cents')
		.min(0, 'Price cannot be negative')
		.max(MAX_MINOR, 'Price is too large')
		.nullable(),
	supplier: lineText(120, { maxMessage: 'Keep the supplier under 120 characters' }).default(''),
	link: lineText(500, { maxMessage: 'Keep the link under 500 characters' }).default(''),
	owned: z
		.number({ error: 'How many is a whole number' })
		.int('How many is a whole number')
		.min(0, 'How many cannot be negative')
		.max(100_000, 'At most 100 000')
		.default(0),
	notes: notesText(2000, { maxMessage: 'Keep the notes under 2000 characters' }).default(''),
};

/** A shelf entry as written by a member: its kind, the kind's fields, and what the team knows of it. */
export const shelfItemSchema = z.discriminatedUnion(
	'kind',
	SHELF_KINDS.map((kind) =>
		z.strictObject({ kind: z.literal(kind), spec: SHELF_SPECS[kind], ...common }),
	) as unknown as [
		z.ZodObject<{ kind: z.ZodEnum<{ [K in ShelfKind]: K }>; spec: SpecSchema } & typeof common>,
	],
	{ error: `Kind is one of ${SHELF_KINDS.join(', ')}` },
);
export type ShelfItemInput = z.infer<typeof shelfItemSchema>;

/** A change to an entry: the whole entry, with the time it was read (a newer save answers 409). */
export const shelfItemUpdateSchema = z.object({
	item: shelfItemSchema,
	updatedAt: z.iso.datetime({ offset: true, error: 'updatedAt is the time the entry was read' }),
});
