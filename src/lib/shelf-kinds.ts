import type { PartGroup } from '@/engine/browser';

/**
 * What a team's shelf holds: every part kind a build places (not nodes), and fuses or breakers
 * (a cable's protection, bought on their own). Adding a part kind to the build adds it here.
 */
export const SHELF_KINDS = [
	'banks',
	'alternators',
	'amplifiers',
	'cables',
	'fuses',
	'loads',
	'isolators',
	'capacitors',
	'chargers',
] as const;
export type ShelfKind = (typeof SHELF_KINDS)[number];

/** One entry of the kind, in words ("a battery bank"). */
export const SHELF_NAMES: Record<ShelfKind, string> = {
	banks: 'a battery bank',
	alternators: 'an alternator',
	amplifiers: 'an amplifier',
	cables: 'a cable',
	fuses: 'a fuse or breaker',
	loads: 'a steady load',
	isolators: 'a relay or isolator',
	capacitors: 'a capacitor module',
	chargers: 'a DC-DC charger',
};

/** The build's part group a shelf kind places as (a fuse goes on a cable's end instead). */
export const SHELF_GROUP: Record<ShelfKind, Exclude<PartGroup, 'nodes'> | null> = {
	banks: 'banks',
	alternators: 'alternators',
	amplifiers: 'amplifiers',
	cables: 'cables',
	fuses: null,
	loads: 'loads',
	isolators: 'isolators',
	capacitors: 'capacitors',
	chargers: 'chargers',
};

/**
 * The fields of a part that belong to where it is placed, not to what it is: a shelf entry leaves
 * them out and the build supplies them (ends, how many, a cable's length and fuses, a bank's
 * charge and mounting, when a relay closes).
 */
export const PLACEMENT_FIELDS: Record<ShelfKind, readonly string[]> = {
	banks: ['stateOfCharge', 'location', 'secured', 'vented'],
	alternators: [],
	amplifiers: ['quantity'],
	cables: ['lengthM', 'parallelRuns', 'fuses', 'connectionResistanceOhm'],
	fuses: ['end', 'distanceM'],
	loads: [],
	isolators: ['closes'],
	capacitors: ['inSeries', 'inParallel'],
	chargers: ['runs'],
};

const PLACE = ['id', 'label', 'positive', 'negative', 'from', 'to'];

/** A part as a shelf entry's fields: the part without its place in a build. */
export function shelfSpecOf(kind: ShelfKind, part: object): Record<string, unknown> {
	const drop = new Set([...PLACE, ...PLACEMENT_FIELDS[kind]]);
	return Object.fromEntries(Object.entries(part).filter(([k]) => !drop.has(k)));
}

/** What one price buys: a cable is priced per metre, everything else per piece. */
export const priceUnit = (kind: ShelfKind) => (kind === 'cables' ? 'per m' : 'each');

/** A shelf entry as the API answers it. */
export interface ShelfItemDto {
	id: string;
	kind: ShelfKind;
	label: string;
	spec: Record<string, unknown>;
	/** Price of one (a cable's per metre) in minor units of the team's currency; null when unknown. */
	priceMinor: number | null;
	supplier: string;
	link: string;
	owned: number;
	notes: string;
	updatedAt: string;
}
