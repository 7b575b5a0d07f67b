import { describe, expect, it } from 'vitest';
import {
	amplifierCurrentA,
	amplifierDraw,
	amplifierDrawCurrent,
	amplifierInputPowerW,
	availableOutputW,
	outputLossDb,
	powerRatioDb,
	unregulatedOutputW,
	voltageRatioDb,
} from '../../src/engine/amplifier';

// CEA-2006 rates mobile amplifiers at 14.4 V. Worked example (computed from I = P/(V·η) and P ∝ V²):
// 2000 W rated at 14.4 V, η = 0.80, unregulated, driven to clipping.
const amp = {
	ratedPowerW: 2000,
	ratedVoltageV: 14.4,
	efficiency: 0.8,
	quantity: 1,
	regulated: false,
};

describe('unregulatedOutputW and supply current', () => {
	it.each([
		[12.0, 1388.9],
		[12.6, 1531.2],
		[13.8, 1836.8],
		[14.4, 2000.0],
		[16.0, 2469.1],
	])('at %f V gives %f W out', (v, outW) => {
		expect(unregulatedOutputW(2000, 14.4, v)).toBeCloseTo(outW, 1);
	});

	// The engine's law, hand-computed: at and below the rating the input is constant power,
	// P_in = 2000/0.8 = 2500 W, so I = 2500/V; above it an unregulated amplifier's input follows
	// (V/V_rated)², I = 2500·V/14.4².
	it.each([
		[12.0, 208.33],
		[12.6, 198.41],
		[13.8, 181.16],
		[14.4, 173.61],
		[16.0, 192.9],
	])('at full drive draws, unregulated, at %f V %f A', (v, a) => {
		expect(amplifierCurrentA(amp, 1, v)).toBeCloseTo(a, 2);
	});

	// A 1000 W amplifier rated at 14.4 V, η = 0.75 (P_in = 1333.3 W): 83.3 A at constant power
	// would understate the draw at 16.0 V; the (V/V_rated)² law gives 1333.3·16/14.4² = 102.9 A.
	it('grows as (V/V_rated)² above the rating, the figure cables are sized from', () => {
		const a1000 = { ...amp, ratedPowerW: 1000, efficiency: 0.75 };
		expect(amplifierCurrentA(a1000, 1, 16)).toBeCloseTo(102.88, 2);
	});

	it('agrees with the solver law (amplifierDrawCurrent) at every voltage and demand', () => {
		for (const d of [1 / 8, 0.5, 1])
			for (const v of [9, 12, 14.4, 15, 16, 18]) {
				const capped = { ...amp, maxOutputW: 2300 };
				expect(amplifierCurrentA(capped, d, v)).toBe(
					amplifierDrawCurrent(amplifierDraw(capped, d), v)[0],
				);
			}
	});

	it('draws 2500 W / V at every voltage when regulated (constant-power input)', () => {
		for (const [v, a] of [
			[12.0, 208.33],
			[12.6, 198.41],
			[13.8, 181.16],
			[14.4, 173.61],
			[16.0, 156.25],
		] as const) {
			expect(amplifierCurrentA({ ...amp, regulated: true }, 1, v)).toBeCloseTo(a, 2);
		}
	});

	it('multiplies input power by quantity and divides by efficiency', () => {
		expect(amplifierInputPowerW({ ...amp, quantity: 3 }, 1 / 8)).toBeCloseTo(
			(3 * 2000) / 8 / 0.8,
			9,
		);
	});
});

describe('level changes', () => {
	// ΔL = 20·log10(V2/V1) at fixed load, referred to the CEA-2006 14.4 V point.
	it.each([
		[12.0, -1.584],
		[12.6, -1.16],
		[13.8, -0.37],
		[16.0, 0.915],
	])('is %f V → %f dB against 14.4 V', (v, db) => {
		expect(voltageRatioDb(v, 14.4)).toBeCloseTo(db, 3);
	});

	it('gives +3.01 dB per power doubling', () => {
		expect(powerRatioDb(2, 1)).toBeCloseTo(3.0103, 4);
	});

	it.each([
		[12.0, 16.0, 2.499],
		[12.6, 16.0, 2.075],
		[12.0, 14.4, 1.584],
	])('gives %f V → %f V as %f dB', (v1, v2, db) => {
		expect(voltageRatioDb(v2, v1)).toBeCloseTo(db, 3);
	});
});

describe('availableOutputW and outputLossDb', () => {
	// An unregulated (fixed-ratio converter) amplifier's rails follow the supply, so its clipping
	// power goes as P_rated·(V/V_rated)² on both sides of the rated voltage: 2000 W at 14.4 V →
	// 2000·(12/14.4)² = 1388.9 W at 12 V (−1.584 dB) and 2000·(16/14.4)² = 2469.1 W at 16 V (+0.915 dB).
	it('follows V² on both sides of the rated voltage', () => {
		expect(availableOutputW(amp, 12)).toBeCloseTo(1388.9, 1);
		expect(availableOutputW(amp, 16)).toBeCloseTo(2469.1, 1);
		expect(outputLossDb(amp, 12)).toBeCloseTo(-1.584, 3);
		expect(outputLossDb(amp, 16)).toBeCloseTo(0.915, 3);
	});

	it('stops at a stated maximum output', () => {
		expect(availableOutputW({ ...amp, maxOutputW: 2200 }, 16)).toBe(2200);
		expect(availableOutputW({ ...amp, maxOutputW: 2200 }, 12)).toBeCloseTo(1388.9, 1);
	});

	// Draw: constant input power up to the rated voltage (conservative for cables), then the input
	// follows the output: I = P_in·V/V_rated² (P_in = P_rated/η). 2000 W, η 0.8 → 2500 W input;
	// at 12.6 V: 2500/12.6 = 198.41 A; at 16 V: 2500·16/14.4² = 192.90 A (vs 156.25 A at constant power).
	it('draws more current above its rated voltage, as its output grows', () => {
		const d = amplifierDraw({ ...amp, efficiency: 0.8, quantity: 1 }, 1);
		expect(amplifierDrawCurrent(d, 12.6)[0]).toBeCloseTo(198.41, 2);
		expect(amplifierDrawCurrent(d, 16)[0]).toBeCloseTo(192.9, 2);
		const capped = amplifierDraw({ ...amp, efficiency: 0.8, quantity: 1, maxOutputW: 2200 }, 1);
		expect(amplifierDrawCurrent(capped, 16)[0]).toBeCloseTo(2750 / 16, 6);
		const regulated = amplifierDraw({ ...amp, efficiency: 0.8, quantity: 1, regulated: true }, 1);
		expect(amplifierDrawCurrent(regulated, 16)[0]).toBeCloseTo(2500 / 16, 6);
	});

	it('loses nothing on a regulated supply', () => {
		expect(outputLossDb({ ...amp, regulated: true }, 11)).toBe(0);
	});
});
