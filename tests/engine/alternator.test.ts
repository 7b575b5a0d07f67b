import { describe, expect, it } from 'vitest';
import { alternatorLimitA, alternatorRpm } from '../../src/engine/alternator';
import { alternator } from '../helpers/networks';

describe('alternatorRpm', () => {
	it('multiplies engine speed by the pulley ratio: 700 rpm × 2.8 = 1960 rpm', () => {
		// Pulley relation n_alt = n_engine × D_crank/D_alt (physics; example from the reference sheet).
		expect(alternatorRpm(700, 2.8)).toBeCloseTo(1960, 9);
	});
});

describe('alternatorLimitA', () => {
	// A marine-engine service manual's curve (secondary source): hot 16 / 41 / 48 A at
	// 1300 / 2500 / 5000 alternator rpm, 13.5 V, pulley 1.78:1.
	const marine = alternator('a', 'p', 'n', 48, {
		pulleyRatio: 1.78,
		curve: [
			{ rpm: 1300, currentA: 16 },
			{ rpm: 2500, currentA: 41 },
			{ rpm: 5000, currentA: 48 },
		],
	});

	it('reads the curve at engine rpm × pulley ratio', () => {
		expect(alternatorLimitA(marine, 2500 / 1.78)).toBeCloseTo(41, 9);
		expect(alternatorLimitA(marine, 5000 / 1.78)).toBeCloseTo(48, 9);
	});

	it('interpolates linearly between curve points and holds above the last', () => {
		expect(alternatorLimitA(marine, 1900 / 1.78)).toBeCloseTo(16 + (25 * 600) / 1200, 9);
		expect(alternatorLimitA(marine, 9000 / 1.78)).toBeCloseTo(48, 9);
	});

	it('gives nothing below the first point (not cut in) and with the engine off', () => {
		expect(alternatorLimitA(marine, 1000 / 1.78)).toBe(0);
		expect(alternatorLimitA(marine, 0)).toBe(0);
	});

	it('derates a cold curve by the hot factor (the manual’s hot/cold ratio at 2500 rpm is 41/50 = 0.82)', () => {
		const cold = {
			...marine,
			curve: [
				{ rpm: 1300, currentA: 24 },
				{ rpm: 2500, currentA: 50 },
			],
			curveIsCold: true,
			hotFactor: 0.82,
		};
		expect(alternatorLimitA(cold, 2500 / 1.78)).toBeCloseTo(41, 9);
	});

	it('scales the default shape to the rated hot output when no curve is given', () => {
		const plain = alternator('a', 'p', 'n', 200, { curve: [], pulleyRatio: 3 });
		expect(alternatorLimitA(plain, 2000)).toBeCloseTo(200, 9); // 6000 rpm: the rating
		expect(alternatorLimitA(plain, 300)).toBe(0); // 900 rpm: below cut-in
	});
});
