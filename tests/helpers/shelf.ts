import { pebbleBuild } from '../../db/demo/builds';
import { PLACEMENT_FIELDS, type ShelfKind } from '../../src/lib/shelf-kinds';

const PLACE = ['id', 'label', 'positive', 'negative', 'from', 'to'];

/** A demo part of the kind as a shelf entry's fields: the part without its place in the build. */
export function specFrom(kind: ShelfKind, part: object): Record<string, unknown> {
	const drop = new Set([...PLACE, ...PLACEMENT_FIELDS[kind]]);
	return Object.fromEntries(Object.entries(part).filter(([k]) => !drop.has(k)));
}

/** A shelf entry for a battery bank, from the demo's own. */
export const shelfBank = (over: Record<string, unknown> = {}) => ({
	kind: 'banks' as const,
	label: 'Spare lithium bank',
	spec: specFrom('banks', pebbleBuild.banks[0]!),
	priceMinor: 45_995,
	supplier: 'Across town',
	link: '',
	owned: 1,
	notes: '',
	...over,
});
