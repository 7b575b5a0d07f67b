import { describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import { upgradeHints } from '../../src/engine/hints';
import { DEFAULT_SCENARIO } from '../../src/engine/report';
import { dbPer100, shelfCostOf } from '../../src/lib/shelf-prices';
import { shelfSpecOf, type ShelfItemDto, type ShelfKind } from '../../src/lib/shelf-kinds';

const entry = (
	kind: ShelfKind,
	spec: object,
	priceMinor: number | null,
	label: string = kind,
): ShelfItemDto => ({
	id: `${kind}-${label}`,
	kind,
	label,
	spec: shelfSpecOf(kind, spec),
	priceMinor,
	supplier: '',
	link: '',
	owned: 0,
	notes: '',
	updatedAt: '2026-12-01T00:00:00.000Z',
});

/**
 * What a ranked change costs from the shelf. The quantities are common practice, no published
 * source: cable bought by the whole metre of its run, one battery per unit of an added string.
 */
describe('pricing the ranked changes from the shelf', () => {
	const hints = upgradeHints(pebbleBuild, {
		engineRpm: DEFAULT_SCENARIO.engineRpm,
		demand: DEFAULT_SCENARIO.burpDemand,
		conductorTempC: DEFAULT_SCENARIO.conductorTempC,
	});

	it('prices an upsized cable by the metre of its run, the cheapest matching entry', () => {
		const hint = hints.find((h) => h.kind === 'upsize_cable' && h.targetId === 'run')!;
		const now = hint.document.cables.find((c) => c.id === 'run')!;
		const shelf = [
			entry('cables', now, 1500, 'dear'),
			entry('cables', now, 1185, 'cheap'),
			entry('cables', { ...now, material: 'aluminium' }, 100, 'other metal'),
			entry('cables', now, null, 'unpriced'),
		];
		const cost = shelfCostOf(pebbleBuild, hint, shelf)!;
		expect(cost.entry.label).toBe('cheap');
		expect(cost.quantity).toBe(Math.ceil(now.lengthM) * now.parallelRuns);
		expect(cost.costMinor).toBe(1185 * cost.quantity);
	});

	it('prices an added string as one battery per unit in series, and a second alternator as one', () => {
		const bankHint = hints.find((h) => h.kind === 'add_bank')!;
		const bank = pebbleBuild.banks.find((b) => b.id === bankHint.targetId)!;
		const shelf = [
			entry('banks', bank, 27_450),
			entry('banks', { ...bank, unitCapacityAh: bank.unitCapacityAh + 10 }, 100),
			entry('alternators', pebbleBuild.alternators[0]!, 64_000),
		];
		const cost = shelfCostOf(pebbleBuild, bankHint, shelf)!;
		expect(cost.quantity).toBe(bank.unitsInSeries);
		expect(cost.costMinor).toBe(27_450 * bank.unitsInSeries);
		const alt = hints.find((h) => h.kind === 'second_alternator')!;
		expect(shelfCostOf(pebbleBuild, alt, shelf)?.costMinor).toBe(64_000);
		// Nothing on the shelf is that part: no price, rather than a wrong one.
		expect(shelfCostOf(pebbleBuild, alt, shelf.slice(0, 2))).toBeNull();
	});

	it('reads dB per 100 spent as the plan comparison does', () => {
		// 0.5 dB for 250.00 is 0.2 dB per 100.
		expect(dbPer100(0.5, 25_000)).toBeCloseTo(0.2, 12);
		expect(dbPer100(-0.1, 25_000)).toBeNull();
		expect(dbPer100(0.5, 0)).toBeNull();
		expect(dbPer100(null, 100)).toBeNull();
	});
});
