import type { Alternator, BatteryBank, BuildDocument, Cable, UpgradeHint } from '@/engine/browser';
import type { ShelfItemDto } from './shelf-kinds';

/** What a single change buys from the team's shelf, at the shelf's price. */
export interface ShelfCost {
	entry: ShelfItemDto;
	/** How many of the entry (pieces, or whole metres of a cable). */
	quantity: number;
	/** The change's cost in minor units: price × quantity, exact. */
	costMinor: number;
}

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

function cheapest(
	entries: ShelfItemDto[],
	kind: ShelfItemDto['kind'],
	fits: (spec: Record<string, unknown>) => boolean,
): ShelfItemDto | null {
	let best: ShelfItemDto | null = null;
	for (const e of entries)
		if (e.kind === kind && e.priceMinor !== null && fits(e.spec))
			if (!best || e.priceMinor < best.priceMinor!) best = e;
	return best;
}

/**
 * The parts a ranked change needs and what they cost from the shelf, where the shelf holds a
 * priced entry that is that part: a cable of the new size and material (by the metre, its run's
 * length rounded up, once per run laid), a battery of the bank's chemistry, cells and capacity (one
 * per unit of the added string), an alternator of the same hot rating. A regulator raised costs no
 * part (zero). Null when the shelf has no such priced entry.
 */
export function shelfCostOf(
	before: BuildDocument,
	hint: UpgradeHint,
	shelf: ShelfItemDto[],
): ShelfCost | null {
	switch (hint.kind) {
		case 'raise_set_point':
			return null;
		case 'upsize_cable': {
			const was = before.cables.find((c) => c.id === hint.targetId);
			const now = hint.document.cables.find((c) => c.id === hint.targetId);
			if (!was || !now) return null;
			const entry = cheapest(
				shelf,
				'cables',
				(s) => same(s.size, now.size) && s.material === now.material,
			);
			if (!entry) return null;
			const runs = runsToLay(was, now);
			const quantity = Math.ceil(now.lengthM - 1e-9) * runs;
			return { entry, quantity, costMinor: entry.priceMinor! * quantity };
		}
		case 'add_bank': {
			const bank = before.banks.find((b) => b.id === hint.targetId);
			if (!bank) return null;
			const entry = cheapest(shelf, 'banks', (s) => sameBattery(s, bank));
			if (!entry) return null;
			const quantity = bank.unitsInSeries;
			return { entry, quantity, costMinor: entry.priceMinor! * quantity };
		}
		case 'second_alternator': {
			const first: Alternator | undefined = before.alternators.find((a) => a.id === hint.targetId);
			if (!first) return null;
			const entry = cheapest(shelf, 'alternators', (s) => s.ratedHotA === first.ratedHotA);
			return entry ? { entry, quantity: 1, costMinor: entry.priceMinor! } : null;
		}
	}
}

/** Runs of new cable a change lays: every run when the size changes, the added ones otherwise. */
const runsToLay = (was: Cable, now: Cable) =>
	same(was.size, now.size) ? now.parallelRuns - was.parallelRuns : now.parallelRuns;

const sameBattery = (s: Record<string, unknown>, bank: BatteryBank) =>
	s.chemistry === bank.chemistry &&
	s.cellsPerUnit === bank.cellsPerUnit &&
	s.unitCapacityAh === bank.unitCapacityAh;

/** dB gained per 100 of the currency spent, as the plan comparison reads it. */
export const dbPer100 = (gainDb: number | null, costMinor: number) =>
	gainDb !== null && gainDb > 0 && costMinor > 0 ? (gainDb / (costMinor / 100)) * 100 : null;
