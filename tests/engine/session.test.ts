import { describe, expect, it } from 'vitest';
import { DEMO_BUILDS } from '../../db/demo/builds';
import { engineOffPlayTime, runSession } from '../../src/engine/session';
import { alternator, amp, bank, cable, doc, node, steady } from '../helpers/networks';

const AWG8 = { kind: 'awg', awg: '8' } as const;
const AWG0 = { kind: 'awg', awg: '1/0' } as const;

/** One 100 Ah AGM bank feeding a constant-current load through a short 1/0 cable. */
function bankAndLoad(currentA: number, over: Parameters<typeof bank>[3] = {}) {
	return doc({
		nodes: [node('gnd', 'chassis'), node('bp', 'battery'), node('lp')],
		banks: [bank('b', 'bp', 'gnd', over)],
		loads: [steady('load', 'lp', 'gnd', currentA)],
		cables: [cable('feed', 'bp', 'lp', AWG0, 0.5)],
	});
}

describe('runSession', () => {
	// Coulomb counting (charge = current × time) with Peukert's law: at the rated current
	// I_H = C/H = 100 Ah / 20 h = 5 A the Peukert factor (I/I_H)^(k−1) is exactly 1. Hand computation:
	// five 10 s burps with 60 s rests = 350 s at 5 A = 0.4861 Ah = 0.004861 of 100 Ah.
	it('counts the charge a constant load takes over the whole session', () => {
		const run = runSession(bankAndLoad(5), { engineRpm: 0, burps: 5, burpS: 10, restS: 60 });
		expect(run.burps).toHaveLength(5);
		expect(run.endSoc.b).toBeCloseTo(0.875 - (5 * 350) / 3600 / 100, 6);
		// After the first burp only its own 10 s have gone: 5 A × 10 s.
		expect(run.burps[0]!.socAfter.b).toBeCloseTo(0.875 - (5 * 10) / 3600 / 100, 7);
	});

	// Peukert's law in coulomb counting: I_eff = I·(I/I_H)^(k−1). At 20 A with k = 1.1 and
	// I_H = 5 A: I_eff = 20 · 4^0.1 = 22.974 A (hand computation).
	it('counts a discharge above the rated current at the Peukert-effective rate', () => {
		const run = runSession(bankAndLoad(20, { peukertK: 1.1 }), {
			engineRpm: 0,
			burps: 2,
			burpS: 30,
			restS: 30,
		});
		expect(run.endSoc.b).toBeCloseTo(0.875 - (22.974 * 120) / 3600 / 100, 5);
	});

	// Charge acceptance as a limit: an AGM bank below the taper (SOC < 0.8) accepts 0.4 C
	// = 40 A from 100 Ah (the chemistry default; common practice, no published source). The
	// alternator at 14.4 V would push (14.4 − 12.4)/0.005 = 400 A into it, so the bank takes
	// exactly 40 A whenever the alternator has that much to spare. Over 5 × (10 + 60) s with no
	// amplifier: 40 A × 350 s = 3.889 Ah = 0.03889 of 100 Ah (hand computation).
	it('recharges the banks in the rests at their acceptance limit', () => {
		const d = doc({
			nodes: [node('gnd', 'chassis'), node('alt'), node('bp', 'battery')],
			alternators: [alternator('alt', 'alt', 'gnd', 120)],
			banks: [bank('b', 'bp', 'gnd', { stateOfCharge: 0.5 })],
			cables: [cable('charge', 'alt', 'bp', AWG0, 1)],
		});
		const run = runSession(d, { burps: 5, burpS: 10, restS: 60 });
		expect(run.endSoc.b).toBeCloseTo(0.5 + (40 * 350) / 3600 / 100, 6);
	});

	it('carries the state of charge from burp to burp: each burp with the engine off sits lower', () => {
		const d = doc({
			nodes: [node('gnd', 'chassis'), node('bp', 'battery'), node('ap'), node('an')],
			banks: [bank('b', 'bp', 'gnd', { unitCapacityAh: 40 })],
			amplifiers: [amp('a', 'ap', 'an', 2000)],
			cables: [cable('feed', 'bp', 'ap', AWG0, 3), cable('gnd', 'an', 'gnd', AWG0, 0.5)],
		});
		const run = runSession(d, { engineRpm: 0, burps: 6, burpS: 15, restS: 30 });
		const lows = run.burps.map((b) => b.lowestAmplifierV!);
		const socs = run.burps.map((b) => b.socAfter.b!);
		for (let i = 1; i < lows.length; i++) {
			expect(lows[i]).toBeLessThan(lows[i - 1]!);
			expect(socs[i]).toBeLessThan(socs[i - 1]!);
		}
		// The trace holds the dips: its lowest point is the last burp's lowest voltage.
		const traced = run.trace.lowestAmplifierV.filter((v): v is number => v !== null);
		expect(Math.min(...traced)).toBeCloseTo(lows.at(-1)!, 9);
		// With the engine off nothing brings the bank back to where it rested before the session.
		expect(run.burps.at(-1)!.busAfterRestV!).toBeLessThan(run.restingV);
	});

	it('comes straight back when the alternator has more to give than the banks take', () => {
		const d = doc({
			nodes: [node('gnd', 'chassis'), node('alt'), node('bp', 'battery'), node('ap'), node('an')],
			alternators: [alternator('alt', 'alt', 'gnd', 200)],
			banks: [bank('b', 'bp', 'gnd')],
			amplifiers: [amp('a', 'ap', 'an', 4000)],
			cables: [
				cable('charge', 'alt', 'bp', AWG0, 1),
				cable('feed', 'bp', 'ap', AWG0, 3),
				cable('gnd', 'an', 'gnd', AWG0, 0.5),
			],
		});
		const run = runSession(d, { burps: 3 });
		for (const b of run.burps) expect(b.recoveryS).toBe(0);
		// The set point is what it rests at (less the alternator's own drop).
		expect(run.restingV).toBeGreaterThan(14.3);
	});

	// IEC 60949 adiabatic relation θf = (θi + β)·exp(I²t/(K²S²)) − β, copper K = 226, β = 234.5.
	// Hand computation: 40 A through 8 AWG (8.367 mm², ASTM B258) for 5 × (10 + 60) = 350 s from
	// 25 °C: I²t/(K²S²) = 1600·350/(226²·8.367²) = 0.15665, θf = 259.5·e^0.15665 − 234.5 = 69.0 °C.
	it('heats each cable by the adiabatic relation over the whole session', () => {
		const d = doc({
			nodes: [node('gnd', 'chassis'), node('bp', 'battery'), node('lp')],
			banks: [bank('b', 'bp', 'gnd', { stringsInParallel: 4 })],
			loads: [steady('load', 'lp', 'gnd', 40)],
			cables: [cable('feed', 'bp', 'lp', AWG8, 0.5)],
		});
		const run = runSession(d, { engineRpm: 0, burps: 5, burpS: 10, restS: 60 });
		expect(run.cables[0]!.finalC).toBeCloseTo(69.0, 0);
		expect(run.cables[0]!.limitC).toBe(105);
	});

	it('stops at a collapse and says when', () => {
		const d = doc({
			nodes: [node('gnd', 'chassis'), node('bp', 'battery'), node('ap'), node('an')],
			banks: [bank('b', 'bp', 'gnd', { unitCapacityAh: 20, unitResistanceOhm: 0.02 })],
			amplifiers: [amp('a', 'ap', 'an', 4000)],
			cables: [cable('feed', 'bp', 'ap', AWG8, 5), cable('gnd', 'an', 'gnd', AWG8, 0.5)],
		});
		const run = runSession(d, { engineRpm: 0, burps: 4 });
		expect(run.collapsedAtS).not.toBeNull();
		expect(run.burps.length).toBeLessThanOrEqual(4);
	});

	it('runs every demo build through a session with figures a chart can draw', () => {
		for (const d of Object.values(DEMO_BUILDS)) {
			const run = runSession(d);
			expect(run.burps.length).toBe(5);
			expect(run.trace.timeS.length).toBeLessThanOrEqual(601);
			for (const v of run.trace.busV) expect(Number.isFinite(v)).toBe(true);
			for (const b of run.burps) expect(b.lowestAmplifierV).toBeGreaterThan(0);
		}
	});

	it('shows what a bigger bank buys: a higher last burp and longer play with the engine off', () => {
		// A state-of-charge fraction need not rise (a stronger bank takes a larger share of each
		// burp); the amplifiers' voltage in the last burp and the charge left in ampere-hours do.
		const base = DEMO_BUILDS['Old Oak'];
		const bigger = structuredClone(base);
		for (const b of bigger.banks) b.stringsInParallel += 2;
		const schedule = { burps: 10, burpS: 30, restS: 20 };
		const a = runSession(base, schedule);
		const b = runSession(bigger, schedule);
		expect(b.burps.at(-1)!.lowestAmplifierV!).toBeGreaterThan(a.burps.at(-1)!.lowestAmplifierV!);
		const ah = (d: typeof base, soc: Record<string, number>) =>
			d.banks.reduce((t, k) => t + soc[k.id]! * k.unitCapacityAh * k.stringsInParallel, 0);
		expect(ah(bigger, b.endSoc)).toBeGreaterThan(ah(base, a.endSoc));
		const opts = { demand: 1 / 8, conductorTempC: 25, cutoffV: null, maxS: 24 * 3600 };
		expect(engineOffPlayTime(bigger, opts).seconds!).toBeGreaterThan(
			engineOffPlayTime(base, opts).seconds!,
		);
	});
});

describe('engineOffPlayTime', () => {
	// Hand computation with Peukert k = 1 (pure coulomb counting): AGM 100 Ah at SOC 0.875,
	// R = 5 mΩ, 20 A, cut-off 12.2 V. Empty when V_oc − I·R = 12.2 V, V_oc = 12.3 V, which the AGM
	// table (12.2 V at 0.25, 12.4 V at 0.5) puts at SOC 0.375. Usable 0.5 × 100 Ah / 20 A = 2.5 h.
	it('plays until the bank reaches its cut-off under load', () => {
		const p = engineOffPlayTime(bankAndLoad(20, { peukertK: 1 }), {
			demand: 1 / 8,
			conductorTempC: 25,
			cutoffV: 12.2,
		});
		expect(p.endedBy).toBe('cutoff');
		expect(p.seconds!).toBeCloseTo(9000, -1);
	});

	// Peukert: t = f·H·(C/(I·H))^k = 0.5 · 20 · (100/400)^1.1 = 2.1764 h = 7835 s (hand computation).
	it('shortens by Peukert’s law above the rated current', () => {
		const p = engineOffPlayTime(bankAndLoad(20, { peukertK: 1.1 }), {
			demand: 1 / 8,
			conductorTempC: 25,
			cutoffV: 12.2,
		});
		expect(p.seconds!).toBeGreaterThan(7835 - 15);
		expect(p.seconds!).toBeLessThan(7835 + 15);
	});

	it('says when the music outlasts the window it looks at', () => {
		const p = engineOffPlayTime(bankAndLoad(1), {
			demand: 1 / 8,
			conductorTempC: 25,
			cutoffV: null,
			maxS: 3600,
		});
		expect(p).toMatchObject({ seconds: null, endedBy: 'limit' });
	});

	it('grows with the bank: two strings play about twice as long', () => {
		const opts = { demand: 1 / 8, conductorTempC: 25, cutoffV: 12.2 };
		const one = engineOffPlayTime(bankAndLoad(20, { peukertK: 1 }), opts).seconds!;
		const two = engineOffPlayTime(bankAndLoad(20, { peukertK: 1, stringsInParallel: 2 }), {
			...opts,
			maxS: 12 * 3600,
		}).seconds!;
		// Twice the capacity and half the resistance: empty at V_oc = 12.25 V (SOC 0.3125), so
		// 0.5625 × 200 Ah / 20 A = 5.625 h (hand computation).
		expect(two / 3600).toBeCloseTo(5.625, 2);
		expect(two).toBeGreaterThan(2 * one);
	});
});
