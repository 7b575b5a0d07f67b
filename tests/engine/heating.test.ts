import { describe, expect, it } from 'vitest';
import { adiabaticFinalC, ADIABATIC_CONSTANTS } from '../../src/engine/heating';
import { buildReport } from '../../src/engine/report';
import { awgAreaMm2 } from '../../src/engine/conductors';
import { amp, bank, cable, doc, node } from '../helpers/networks';

// 4 AWG: d = 0.2043 in (ASTM B258) → 41 738.49 cmil = 21.1492 mm².
const S4 = awgAreaMm2('4');

describe('adiabatic short-time heating (IEC 60949: I²t = K²S² ln((θf + β)/(θi + β)))', () => {
	it('heats 4 AWG copper as the formula does by hand', () => {
		expect(S4).toBeCloseTo(21.1492, 4);
		// Copper K = 226, β = 234.5 (IEC 60949 table; from memory of it).
		// 300 A for 10 s from 25 °C: I²t/(K²S²) = 9e5 / (226² · 21.1492²) = 0.039395
		// → θf = 259.5 · e^0.039395 − 234.5 = 35.43 °C.
		expect(adiabaticFinalC('copper', S4, 300, 10, 25)).toBeCloseTo(35.43, 2);
		// 600 A: the exponent quadruples, 0.157579 → 69.29 °C.
		expect(adiabaticFinalC('copper', S4, 600, 10, 25)).toBeCloseTo(69.29, 2);
		// Aluminium K = 148, β = 228 (same table): 300 A → exponent 0.091861 → 49.34 °C.
		expect(adiabaticFinalC('aluminium', S4, 300, 10, 25)).toBeCloseTo(49.34, 2);
	});

	it('takes the energy it is given back out: the temperature reached gives back I²t exactly', () => {
		const { K, beta } = ADIABATIC_CONSTANTS.copper;
		const final = adiabaticFinalC('copper', 50, 1200, 4, 40);
		expect(K * K * 50 * 50 * Math.log((final + beta) / (40 + beta))).toBeCloseTo(1200 ** 2 * 4, 3);
		// No current, no time, no area: nothing happens.
		expect(adiabaticFinalC('copper', 50, 0, 4, 40)).toBe(40);
		expect(adiabaticFinalC('copper', 50, 100, 0, 40)).toBe(40);
	});

	it('reports each cable’s burp temperature and a danger finding past its insulation', () => {
		// A stiff 12.6 V bank into a 3 kW amplifier through 10 AWG feeds: ~240 A through 5.26 mm².
		const d = doc({
			nodes: [node('gnd', 'chassis'), node('b', 'battery'), node('ap'), node('an')],
			banks: [bank('bk', 'b', 'gnd', { unitResistanceOhm: 1e-4, stringsInParallel: 4 })],
			amplifiers: [amp('a', 'ap', 'an', 3000)],
			cables: [
				cable('feed', 'b', 'ap', { kind: 'awg', awg: '10' }, 0.5),
				cable('ret', 'an', 'gnd', { kind: 'awg', awg: '1/0' }, 0.5),
			],
		});
		const r = buildReport(d, { burpSeconds: 10, conductorTempC: 25 }, { burpRun: false });
		if (!r.ok) throw new Error('does not solve');
		const feed = r.cables.find((c) => c.id === 'feed')!;
		const i = Math.abs(feed.burp.currentA);
		expect(feed.burpHeating.finalC).toBeCloseTo(
			adiabaticFinalC('copper', awgAreaMm2('10'), i, 10, 25),
			9,
		);
		expect(feed.burpHeating.finalC).toBeGreaterThan(feed.burpHeating.limitC);
		expect(r.warnings.find((w) => w.code === 'cable_hot_in_burp')?.element.id).toBe('feed');
		const ret = r.cables.find((c) => c.id === 'ret')!;
		expect(ret.burpHeating.finalC).toBeLessThan(ret.burpHeating.limitC);
		expect(r.warnings.filter((w) => w.code === 'cable_hot_in_burp')).toHaveLength(1);
	});
});
