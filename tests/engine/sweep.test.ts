import { describe, expect, it } from 'vitest';
import { marlinBuild } from '../../db/demo/builds';
import { alternatorLimitA } from '../../src/engine/alternator';
import { solveNetwork } from '../../src/engine/solve';
import { SWEEP_RPMS, speedSweep } from '../../src/engine/sweep';
import { alternator, amp, bank, doc, node } from '../helpers/networks';

describe('speedSweep: the system from idle to high engine speed', () => {
	it('is the network solved at each speed: the same figures as one solve there', () => {
		const s = speedSweep(marlinBuild, { burpDemand: 1, conductorTempC: 25 });
		expect(s.burp.map((p) => p.engineRpm)).toEqual(SWEEP_RPMS);
		for (const p of [s.burp[0]!, s.burp[9]!, s.burp.at(-1)!]) {
			const one = solveNetwork(marlinBuild, {
				engineRpm: p.engineRpm,
				demand: 1,
				conductorTempC: 25,
			});
			expect(p.alternatorA).toBeCloseTo(
				one.alternators.reduce((t, a) => t + a.currentA, 0),
				9,
			);
			expect(p.bankA).toBeCloseTo(
				one.banks.reduce((t, b) => t + b.currentA, 0),
				9,
			);
		}
	});

	it('gives a current-limited alternator its curve times the pulley ratio, and the banks the rest (Kirchhoff’s current law)', () => {
		// One alternator far too small for a 3 kW amplifier: it sits at its limit at every speed, so
		// its output follows its curve; the bank carries the difference.
		const d = doc({
			nodes: [node('gnd', 'chassis'), node('bus', 'block')],
			banks: [bank('b', 'bus', 'gnd', { stateOfCharge: 0.9 })],
			alternators: [alternator('alt', 'bus', 'gnd', 80, { setPointV: 14.4 })],
			amplifiers: [amp('a', 'bus', 'gnd', 3000)],
		});
		const s = speedSweep(d, { burpDemand: 1 });
		for (const p of s.burp) {
			expect(p.alternatorA).toBeCloseTo(alternatorLimitA(d.alternators[0]!, p.engineRpm), 6);
			// What the amplifier draws is what the sources give (no cables, no other load).
			const drawn = solveNetwork(d, { engineRpm: p.engineRpm, demand: 1, conductorTempC: 25 })
				.amplifiers[0]!.currentA;
			expect(p.alternatorA + p.bankA).toBeCloseTo(drawn, 6);
		}
		// A faster engine never gives less alternator current nor leaves the bank more to carry.
		for (let i = 1; i < s.burp.length; i++) {
			expect(s.burp[i]!.alternatorA).toBeGreaterThanOrEqual(s.burp[i - 1]!.alternatorA - 1e-9);
			expect(s.burp[i]!.bankA).toBeLessThanOrEqual(s.burp[i - 1]!.bankA + 1e-9);
		}
	});
});
