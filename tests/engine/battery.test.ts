import { describe, expect, it } from 'vitest';
import { bankCarryHours } from '../../src/engine/budget';
import {
	bankChargeTargets,
	bankThevenin,
	cellOcv,
	chargeAcceptanceA,
	peukertEffectiveCurrentA,
	peukertHours,
	socAtCellOcv,
} from '../../src/engine/battery';
import { bank } from '../helpers/networks';

describe('peukertHours', () => {
	// Peukert's law I^k·t = const referred to C at H hours: t = H·(C/(I·H))^k.
	// Worked example: 100 Ah at the 20 h rate (5 A), computed from the formula.
	it.each([
		[1.05, 25, 3.691, 92.3],
		[1.05, 50, 1.783, 89.1],
		[1.05, 100, 0.861, 86.1],
		[1.1, 25, 3.405, 85.1],
		[1.1, 50, 1.589, 79.4],
		[1.1, 100, 0.741, 74.1],
		[1.2, 25, 2.899, 72.5],
		[1.2, 50, 1.262, 63.1],
		[1.2, 100, 0.549, 54.9],
		[1.3, 25, 2.468, 61.7],
		[1.3, 50, 1.002, 50.1],
		[1.3, 100, 0.407, 40.7],
	])('with k = %f at %d A lasts %f h (%f Ah)', (k, amps, hours, ah) => {
		const t = peukertHours(100, 20, amps, k);
		expect(t).toBeCloseTo(hours, 3);
		expect(t * amps).toBeCloseTo(ah, 1);
	});

	it('reduces to C/I when k = 1', () => {
		expect(peukertHours(100, 20, 40, 1)).toBeCloseTo(2.5, 12);
	});

	it('scales with bank size at the same ratio I/I_rated (4 × 100 Ah at 200 A, k 1.1 → 1.589 h)', () => {
		expect(peukertHours(400, 20, 200, 1.1)).toBeCloseTo(1.589, 3);
	});

	it('counts charge consistently: C / I_eff equals the Peukert time', () => {
		const eff = peukertEffectiveCurrentA(100, 20, 50, 1.2);
		expect(100 / eff).toBeCloseTo(peukertHours(100, 20, 50, 1.2), 10);
	});
});

describe('bankThevenin', () => {
	// Series/parallel equivalents (physics): V = Ns·V_cell, R = Ns·R/Np, C = Np·C.
	it('puts four 12.8 V, 4 mΩ units in parallel as 12.8 V, 1.0 mΩ', () => {
		const b = bank('b', 'p', 'n', {
			chemistry: 'lfp',
			cellsPerUnit: 4,
			stringsInParallel: 4,
			unitResistanceOhm: 0.004,
			stateOfCharge: 1,
		});
		const th = bankThevenin(b, 0.6);
		expect(th.resistanceOhm).toBeCloseTo(0.001, 12);
		expect(th.capacityAh).toBe(400);
	});

	it('gives a 4s LiFePO4 string of 3.3 V, 0.5 mΩ cells as 13.2 V, 2.0 mΩ and 5s as 16.5 V, 2.5 mΩ', () => {
		// cellOcv('lfp', 0.6) is 3.30 V on our plateau table.
		expect(cellOcv('lfp', 0.6)).toBeCloseTo(3.3, 9);
		const four = bankThevenin(
			bank('b', 'p', 'n', { chemistry: 'lfp', cellsPerUnit: 4, unitResistanceOhm: 0.002 }),
			0.6,
		);
		expect(four.ocvV).toBeCloseTo(13.2, 9);
		expect(four.resistanceOhm).toBeCloseTo(0.002, 12);
		const five = bankThevenin(
			bank('b', 'p', 'n', {
				chemistry: 'lfp',
				cellsPerUnit: 5,
				unitResistanceOhm: 0.0025,
				stringsInParallel: 2,
			}),
			0.6,
		);
		expect(five.ocvV).toBeCloseTo(16.5, 9);
		expect(five.resistanceOhm).toBeCloseTo(0.00125, 12);
	});
});

describe('cellOcv', () => {
	// Flooded 12 V rested OCV rule of thumb (secondary source, common practice):
	// 100 % 12.6, 75 % 12.4, 50 % 12.2, 25 % 12.0 V.
	it.each([
		[1, 12.6],
		[0.75, 12.4],
		[0.5, 12.2],
		[0.25, 12.0],
	])('gives a flooded battery at %f SOC %f V', (soc, v) => {
		expect(6 * cellOcv('flooded', soc)).toBeCloseTo(v, 9);
	});

	it('inverts: socAtCellOcv(cellOcv(s)) = s', () => {
		for (const chem of ['flooded', 'agm', 'lfp'] as const) {
			for (const s of [0.05, 0.3, 0.55, 0.85, 0.97])
				expect(socAtCellOcv(chem, cellOcv(chem, s))).toBeCloseTo(s, 9);
		}
	});
});

describe('bankChargeTargets', () => {
	// Lead-acid absorption ≈ 2.40 V/cell (14.4 V) and float 2.25 V/cell (13.5 V) at 25 °C
	// (secondary: battery-education pages); LiFePO4 charge limit 3.65 V/cell (vendor data).
	it('gives a flooded 12 V battery 14.4 V absorption and 13.5 V float', () => {
		const t = bankChargeTargets(bank('b', 'p', 'n', { chemistry: 'flooded' }));
		expect(t.absorptionV).toBeCloseTo(14.4, 9);
		expect(t.floatV).toBeCloseTo(13.5, 9);
	});

	it('gives a 5-cell LiFePO4 unit an 18.25 V limit', () => {
		expect(
			bankChargeTargets(bank('b', 'p', 'n', { chemistry: 'lfp', cellsPerUnit: 5 })).maxV,
		).toBeCloseTo(18.25, 9);
	});

	it('scales per-unit overrides by units in series', () => {
		const t = bankChargeTargets(
			bank('b', 'p', 'n', { unitsInSeries: 2, absorptionV: 14.6, floatV: 13.6 }),
		);
		expect(t.absorptionV).toBeCloseTo(29.2, 9);
	});
});

describe('chargeAcceptanceA', () => {
	it('tapers toward full and never rises with state of charge (common practice)', () => {
		const b = bank('b', 'p', 'n');
		let last = Number.POSITIVE_INFINITY;
		for (let s = 0; s <= 1.0001; s += 0.05) {
			const a = chargeAcceptanceA(b, Math.min(1, s));
			expect(a).toBeLessThanOrEqual(last + 1e-12);
			last = a;
		}
		expect(chargeAcceptanceA(b, 1)).toBeCloseTo(0.02 * 0.4 * 100, 9);
	});
});

describe('bankCarryHours', () => {
	it('applies Peukert to the usable fraction above the cut-off', () => {
		const b = bank('b', 'p', 'n', {
			chemistry: 'agm',
			stateOfCharge: 1,
			unitResistanceOhm: 1e-9,
			peukertK: 1.1,
		});
		// With no resistance the cut-off at the 0 % rested voltage leaves the whole capacity.
		expect(bankCarryHours(b, 50, 12.0)).toBeCloseTo(peukertHours(100, 20, 50, 1.1), 6);
		// A cut-off at the 50 % rested voltage leaves half.
		expect(bankCarryHours(b, 50, 12.4)).toBeCloseTo(0.5 * peukertHours(100, 20, 50, 1.1), 6);
	});
});
