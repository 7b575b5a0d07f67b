import { describe, expect, it } from 'vitest';
import {
	ampacityEstimate,
	awgAreaCmil,
	awgAreaMm2,
	awgDiameterIn,
	cableResistanceOhm,
	cmilPerAmp,
	MATERIAL_PROPS,
	MM2_PER_CMIL,
	requiredCmilPerAmp,
	resistancePerMetre,
	resistivityAt,
	solidResistancePerMetre,
	STRANDING_FACTOR,
} from '../../src/engine/conductors';
import type { AwgSize, Material } from '../../src/engine/types';

const FT = 0.3048;
/** The solid-formula figure (ρ/A), as the wire tables print it. */
const solidOhmPerKft = (awg: AwgSize, material: Material, tempC = 20) =>
	solidResistancePerMetre({ kind: 'awg', awg }, material, tempC) * 1000 * FT;
/** What the engine uses for a stranded cable (with the lay increment). */
const ohmPerKft = (awg: AwgSize, material: Material, tempC = 20) =>
	resistancePerMetre({ kind: 'awg', awg }, material, tempC) * 1000 * FT;

describe('awgDiameterIn', () => {
	// ASTM B258 definition: No. 36 = 0.0050 in, No. 0000 = 0.4600 in, 39 geometric steps.
	// Expected diameters: the formula d = 0.005·92^((36−n)/39), evaluated to 5 decimals.
	it.each([
		['8', 0.12849],
		['6', 0.16202],
		['4', 0.20431],
		['2', 0.25763],
		['1', 0.2893],
		['1/0', 0.32486],
		['2/0', 0.3648],
		['3/0', 0.40964],
		['4/0', 0.46],
	] as const)('gives the B258 formula diameter for %s AWG', (awg, inches) => {
		expect(awgDiameterIn(awg, { rounded: false })).toBeCloseTo(inches, 5);
	});

	// ASTM B33-04 Table 1 (seen): rounded diameters, areas in cmil and mm².
	it.each([
		['4/0', 0.46, 211600.0, 107.2193],
		['3/0', 0.4096, 167772.16, 85.0114],
		['2/0', 0.3648, 133079.04, 67.4321],
		['1/0', 0.3249, 105560.01, 53.488],
	] as const)('matches ASTM B33 Table 1 for %s AWG', (awg, d, cmil, mm2) => {
		expect(awgDiameterIn(awg)).toBe(d);
		expect(awgAreaCmil(awg)).toBeCloseTo(cmil, 1);
		expect(awgAreaMm2(awg)).toBeCloseTo(mm2, 3);
	});

	// NEC Chapter 9 Table 8 areas, printed to 4 significant figures (secondary reproductions).
	it.each([
		['8', 16510],
		['6', 26240],
		['4', 41740],
		['2', 66360],
		['1', 83690],
		['1/0', 105600],
		['2/0', 133100],
		['3/0', 167800],
		['4/0', 211600],
	] as const)('rounds to the NEC Table 8 area for %s AWG', (awg, cmil) => {
		const area = awgAreaCmil(awg);
		expect(Number(area.toPrecision(4))).toBe(cmil);
	});

	it('doubles the area every three gauges (92^(6/39) = 2.00503, from the B258 definition)', () => {
		const unrounded = (awg: AwgSize) => awgDiameterIn(awg, { rounded: false }) ** 2;
		expect(unrounded('1') / unrounded('4')).toBeCloseTo(2.00503, 5);
		expect(unrounded('1/0') / unrounded('6')).toBeCloseTo(2.00503 ** 2, 4);
	});
});

describe('material resistivity', () => {
	it('uses annealed copper at 100 % IACS: 1/58 Ω·mm²/m = 10.371 Ω·cmil/ft (IEC 60028 / ASTM B233)', () => {
		expect(MATERIAL_PROPS.copper.resistivity20).toBeCloseTo(0.017241, 6);
		const ohmCmilPerFt = (MATERIAL_PROPS.copper.resistivity20 / MM2_PER_CMIL) * FT;
		expect(ohmCmilPerFt).toBeCloseTo(10.3712, 3);
	});

	it('defines the circular mil exactly from the inch: 5.067075e-4 mm²', () => {
		expect(MM2_PER_CMIL).toBeCloseTo(5.067075e-4, 10);
	});

	// Multipliers R(T)/R20 = 1 + 0.00393·(T − 20) for 100 % IACS copper (handbook α20 = 3.93e-3).
	it.each([
		[-20, 0.8428],
		[0, 0.9214],
		[60, 1.1572],
		[75, 1.2162],
		[105, 1.334],
	])('scales copper resistance at %d °C by %f', (t, factor) => {
		expect(resistivityAt('copper', t) / resistivityAt('copper', 20)).toBeCloseTo(factor, 4);
	});

	it('agrees with the IEC 60228 temperature correction at 75 °C (1/0.820) within 0.4 %', () => {
		// IEC 60228 correction factor k = 0.820 at 75 °C (secondary reproduction).
		const ratio = resistivityAt('copper', 75) / resistivityAt('copper', 20);
		expect(Math.abs(ratio / (1 / 0.82) - 1)).toBeLessThan(0.004);
	});
});

describe('resistancePerMetre', () => {
	// Ω per 1000 ft at 20 °C computed as ρ·1000/area(cmil) from B258 areas and the conductivities:
	// copper 100 % IACS, aluminium 1350 at 61 % IACS (ASTM wire-spec minimum), CCA 10 %/15 % at the
	// 62.9 % / 64.4 % IACS minimum a B566 wire maker states.
	it.each([
		['8', 0.6281, 1.02967, 0.99857, 0.97531],
		['6', 0.39518, 0.64784, 0.62827, 0.61364],
		['4', 0.24848, 0.40735, 0.39505, 0.38584],
		['2', 0.15629, 0.25622, 0.24848, 0.24269],
		['1', 0.12392, 0.20314, 0.19701, 0.19242],
		['1/0', 0.09825, 0.16106, 0.1562, 0.15256],
		['2/0', 0.07793, 0.12776, 0.1239, 0.12101],
		['3/0', 0.06182, 0.10134, 0.09828, 0.09599],
		['4/0', 0.04901, 0.08035, 0.07792, 0.07611],
	] as const)('gives %s AWG in copper, aluminium and CCA', (awg, cu, al, cca10, cca15) => {
		expect(solidOhmPerKft(awg, 'copper')).toBeCloseTo(cu, 4);
		expect(solidOhmPerKft(awg, 'aluminium')).toBeCloseTo(al, 4);
		expect(solidOhmPerKft(awg, 'cca10')).toBeCloseTo(cca10, 4);
		expect(solidOhmPerKft(awg, 'cca15')).toBeCloseTo(cca15, 4);
		// Stranded: the ASTM B8 lay increment on top.
		expect(ohmPerKft(awg, 'copper') / solidOhmPerKft(awg, 'copper')).toBeCloseTo(
			STRANDING_FACTOR,
			12,
		);
	});

	// NEC (NFPA 70) Chapter 9 Table 8, DC resistance at 75 °C, stranded uncoated copper and
	// aluminium, Ω/kft (two web reproductions). With the lay increment the engine's copper is within
	// 1 % of every figure from 8 AWG to 4/0; the solid formula alone sits about 2 % low.
	it.each([
		['8', 0.778, 1.28],
		['6', 0.491, 0.808],
		['4', 0.308, 0.508],
		['2', 0.194, 0.319],
		['1', 0.154, 0.253],
		['1/0', 0.122, 0.201],
		['2/0', 0.0967, 0.159],
		['3/0', 0.0766, 0.126],
		['4/0', 0.0608, 0.1],
	] as const)('is within 1 %% of NEC Table 8 for %s AWG stranded at 75 °C', (awg, cu, al) => {
		expect(Math.abs(ohmPerKft(awg, 'copper', 75) / cu - 1)).toBeLessThan(0.01);
		expect(cu / solidOhmPerKft(awg, 'copper', 75)).toBeGreaterThan(1.012);
		// Aluminium 1350 at the 61 % IACS minimum: within 2 % of the table.
		expect(Math.abs(ohmPerKft(awg, 'aluminium', 75) / al - 1)).toBeLessThan(0.02);
	});

	// IEC 60228 class 5 (flexible) copper, maximum resistance at 20 °C, Ω/km (reproductions agree).
	// A maximum: the nominal-area solid value must be below it, and not absurdly far below.
	it.each([
		[10, 1.91],
		[16, 1.21],
		[25, 0.78],
		[35, 0.554],
		[50, 0.386],
		[70, 0.272],
		[95, 0.206],
		[120, 0.161],
	])('stays under the IEC 60228 class 5 maximum for %d mm²', (mm2, maxOhmPerKm) => {
		const r = resistancePerMetre({ kind: 'mm2', mm2 }, 'copper', 20) * 1000;
		expect(r).toBeLessThan(maxOhmPerKm);
		expect(r).toBeGreaterThan(0.8 * maxOhmPerKm);
	});
});

describe('cableResistanceOhm', () => {
	it('divides by parallel runs and scales with length (Ohm’s law, R = ρL/A)', () => {
		const one = cableResistanceOhm({
			size: { kind: 'awg', awg: '1/0' },
			material: 'copper',
			lengthM: 20 * FT,
			parallelRuns: 1,
		});
		const two = cableResistanceOhm({
			size: { kind: 'awg', awg: '1/0' },
			material: 'copper',
			lengthM: 20 * FT,
			parallelRuns: 2,
		});
		// Worked example: 1/0 copper, 20 ft loop at 20 °C = 1.9650 mΩ solid (0.09825 Ω/kft × 20 ft),
		// times the lay increment for stranded cable.
		expect(one * 1000).toBeCloseTo(1.965 * STRANDING_FACTOR, 3);
		expect(two).toBeCloseTo(one / 2, 12);
	});

	it('accepts a measured cross-section for cable sold under a gauge it does not meet', () => {
		// A marine-cable catalogue gives SAE "4 gauge" as 37 360 cmil against 41 740 for 4 AWG.
		const sae4 = cableResistanceOhm({
			size: { kind: 'measured', areaMm2: 37360 * MM2_PER_CMIL },
			material: 'copper',
			lengthM: 1,
			parallelRuns: 1,
		});
		const awg4 = cableResistanceOhm({
			size: { kind: 'awg', awg: '4' },
			material: 'copper',
			lengthM: 1,
			parallelRuns: 1,
		});
		expect(sae4 / awg4).toBeCloseTo(41738 / 37360, 3);
	});
});

describe('circular mils per amp', () => {
	it('asks 300 cmil/A of copper and scales for CCA by resistivity (common practice, no published source)', () => {
		expect(requiredCmilPerAmp('copper')).toBe(300);
		expect(requiredCmilPerAmp('cca10')).toBeCloseTo(300 / 0.629, 6);
	});

	it('converts 300 cmil/A to 6.578 A/mm²', () => {
		expect(1 / (300 * MM2_PER_CMIL)).toBeCloseTo(6.578, 3);
	});

	it('reports 1/0 AWG at 150 A as 703.7 cmil/A', () => {
		expect(cmilPerAmp({ kind: 'awg', awg: '1/0' }, 1, 150)).toBeCloseTo(105560 / 150, 0);
	});
});

describe('ampacityEstimate', () => {
	// 33 CFR 183.425 Table 5, allowable amperage, 30 °C ambient.
	it.each([
		['8', 105, 80],
		['4', 105, 160],
		['1/0', 105, 285],
		['4/0', 105, 445],
		['4', 60, 105],
		['2/0', 200, 370],
	] as const)('reads %s AWG at %d °C insulation as %d A', (awg, insulationC, amps) => {
		const est = ampacityEstimate({
			size: { kind: 'awg', awg },
			material: 'copper',
			parallelRuns: 1,
			insulationC,
		});
		expect(est).toEqual({ currentA: amps, basis: 'table', columnC: insulationC });
	});

	it('uses the highest column not above the insulation rating', () => {
		const est = ampacityEstimate({
			size: { kind: 'awg', awg: '4' },
			material: 'copper',
			parallelRuns: 1,
			insulationC: 100,
		});
		expect(est?.columnC).toBe(90);
		expect(est?.currentA).toBe(135);
	});

	it('interpolates a metric size between its AWG neighbours and adds parallel runs', () => {
		const mm50 = ampacityEstimate({
			size: { kind: 'mm2', mm2: 50 },
			material: 'copper',
			parallelRuns: 1,
			insulationC: 105,
		})!;
		expect(mm50.basis).toBe('interpolated');
		expect(mm50.currentA).toBeGreaterThan(245); // 1 AWG, 42.4 mm²
		expect(mm50.currentA).toBeLessThan(285); // 1/0 AWG, 53.5 mm²
		const doubled = ampacityEstimate({
			size: { kind: 'mm2', mm2: 50 },
			material: 'copper',
			parallelRuns: 2,
			insulationC: 105,
		})!;
		expect(doubled.currentA).toBeCloseTo(2 * mm50.currentA, 9);
	});

	it('refuses to guess below the lowest rated column', () => {
		expect(
			ampacityEstimate({
				size: { kind: 'awg', awg: '4' },
				material: 'copper',
				parallelRuns: 1,
				insulationC: 50,
			}),
		).toBeNull();
	});

	it('derates aluminium-based conductors for equal heating, √(ρCu/ρ)', () => {
		const cu = ampacityEstimate({
			size: { kind: 'awg', awg: '4' },
			material: 'copper',
			parallelRuns: 1,
			insulationC: 105,
		})!;
		const cca = ampacityEstimate({
			size: { kind: 'awg', awg: '4' },
			material: 'cca10',
			parallelRuns: 1,
			insulationC: 105,
		})!;
		expect(cca.currentA).toBeCloseTo(cu.currentA * Math.sqrt(0.629), 9);
	});
});
