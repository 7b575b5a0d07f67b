import { describe, expect, it } from 'vitest';
import { ampacityEstimate } from '../../src/engine/conductors';
import { adviseFuse, MAX_FUSE_FACTOR } from '../../src/engine/fuses';

describe('adviseFuse', () => {
	it('allows up to 150 % of the conductor’s allowable amperage below 50 V (33 CFR 183.455(c))', () => {
		expect(MAX_FUSE_FACTOR).toBe(1.5);
	});

	// Worked example: 4 AWG at 105 °C carries 160 A (33 CFR 183.425 Table 5), so the largest fuse
	// that protects it is 240 A; 1/0 → 427.5 A; 4/0 → 667.5 A.
	it.each([
		['4', 160, 240],
		['1/0', 285, 427.5],
		['4/0', 445, 667.5],
	] as const)('caps the fuse for %s AWG at %f A', (awg, amps, maxA) => {
		const capacity = ampacityEstimate({
			size: { kind: 'awg', awg },
			material: 'copper',
			parallelRuns: 1,
			insulationC: 105,
		})!;
		expect(capacity.currentA).toBe(amps);
		const advice = adviseFuse(100, capacity.currentA);
		expect(advice).toMatchObject({ status: 'ok', maxA });
	});

	it('picks the smallest standard rating at or above the design current', () => {
		expect(adviseFuse(152, 160)).toEqual({ status: 'ok', recommendedA: 175, maxA: 240 });
		expect(adviseFuse(150, 160)).toEqual({ status: 'ok', recommendedA: 150, maxA: 240 });
	});

	it('says plainly when no rating fits because the cable is too small', () => {
		const advice = adviseFuse(260, 160);
		expect(advice.status).toBe('cable_too_small');
		if (advice.status === 'cable_too_small') expect(advice.message).toMatch(/too small/);
	});
});
