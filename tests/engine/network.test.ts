import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { cableAreaMm2, STRANDING_FACTOR } from '../../src/engine/conductors';
import { bankThevenin, chargeAcceptanceA } from '../../src/engine/battery';
import { buildReport } from '../../src/engine/report';
import { solveNetwork } from '../../src/engine/solve';
import type { BuildDocument } from '../../src/engine/types';
import {
	alternator,
	amp,
	bank,
	cable,
	doc,
	node,
	randomNetwork,
	steady,
} from '../helpers/networks';

const FT = 0.3048;
const AT = { engineRpm: 1000, demand: 1, conductorTempC: 20 };

/**
 * One loop: a stiff source, 14 ft of 2 AWG copper out and 5 ft back (19 ft). Hand computation:
 * d = 0.005·92^(34/39) = 0.2576 in (ASTM B258, rounded as tabulated) → 66 357.76 cmil = 33.6240 mm²;
 * R'₂₀ = (1/58 Ω·mm²/m, IEC 60028 annealed copper) / 33.6240 mm² = 0.51275 mΩ/m; 19 ft = 5.7912 m
 * → R₂₀ = 2.9696 mΩ (solid-conductor figure).
 */
function loop(
	load: { amp?: number; steadyA?: number },
	over: Parameters<typeof cable>[5] = {},
): BuildDocument {
	return doc({
		nodes: [node('gnd', 'chassis'), node('src'), node('lp'), node('ln')],
		alternators: [
			alternator('alt', 'src', 'gnd', 5000, { setPointV: 12, sourceResistanceOhm: 1e-6 }),
		],
		amplifiers: load.amp ? [amp('a', 'lp', 'ln', load.amp)] : [],
		loads: load.steadyA ? [steady('l', 'lp', 'ln', load.steadyA)] : [],
		cables: [
			cable('pos', 'src', 'lp', { kind: 'awg', awg: '2' }, 14 * FT, over),
			cable('neg', 'ln', 'gnd', { kind: 'awg', awg: '2' }, 5 * FT, over),
		],
	});
}

const loopDrop = (s: ReturnType<typeof solveNetwork>) =>
	s.cables.reduce((sum, c) => sum + c.dropV, 0);
const loopLoss = (s: ReturnType<typeof solveNetwork>) =>
	s.cables.reduce((sum, c) => sum + c.lossW, 0);

describe('solveNetwork: loop drop and loss (Ohm’s law, hand computation)', () => {
	// 2 AWG, 19 ft loop, 125 A: V = I·R, P = I²·R with R from the solid formula above, at 60 °C
	// ×[1 + 0.00393·40] (IEC 60028 coefficient); CCA and aluminium by their IACS minimum (62.9 %,
	// 64.4 %, 61 %) and α 0.0040 / 0.00403. Stranded cable carries the ASTM B8 lay increment on top
	// (STRANDING_FACTOR, 2 %).
	it.each([
		['copper', 20, 0.3712, 46.4],
		['copper', 60, 0.4295, 53.69],
		['cca10', 20, 0.5901, 73.77],
		['cca15', 20, 0.5764, 0],
		['aluminium', 20, 0.6085, 0],
	] as const)('drops the hand-computed figure for %s at %d °C', (material, tempC, dropV, lossW) => {
		const s = solveNetwork(loop({ steadyA: 125 }, { material }), { ...AT, conductorTempC: tempC });
		expect(loopDrop(s)).toBeCloseTo(dropV * STRANDING_FACTOR, 3);
		if (lossW) expect(loopLoss(s)).toBeCloseTo(lossW * STRANDING_FACTOR, 1);
		expect(s.cables[0]!.currentA).toBeCloseTo(125, 6); // less the 1 nS leak to chassis
	});
});

describe('solveNetwork: loop drop with NEC Chapter 9 Table 8 resistance', () => {
	// The same loop with the stranded-copper figure of NEC Table 8 for 2 AWG at 75 °C, 0.194 Ω/kft:
	// 19 ft → 3.686 mΩ, 125 A → 0.4608 V, 57.6 W. Within 1 % (the table prints three figures).
	it('drops what Table 8 gives for 2 AWG copper at 75 °C', () => {
		const s = solveNetwork(loop({ steadyA: 125 }), { ...AT, conductorTempC: 75 });
		expect(Math.abs(loopDrop(s) / 0.4608 - 1)).toBeLessThan(0.01);
		expect(Math.abs(loopLoss(s) / 57.6 - 1)).toBeLessThan(0.01);
	});
});

describe('solveNetwork: constant-power load through a loop (closed form)', () => {
	// V_load = [V_s + √(V_s² − 4·R·P)]/2: the high root of P = V·(V_s − V)/R, here P = 1800 W and
	// R = 2.9696 mΩ (the loop above), figures from that formula by hand.
	it.each([
		[12.0, 11.5367, 156.024],
		[12.6, 12.1604, 148.021],
		[13.8, 13.4011, 134.317],
		[14.4, 14.0187, 128.4],
		[16.0, 15.6586, 114.952],
	])('at %f V source puts the amplifier at %f V drawing %f A', (vs, vAmp, amps) => {
		const d = loop({ amp: 1800 });
		d.alternators[0]!.setPointV = vs;
		// A constant-power load: a regulated amplifier, whatever the supply.
		d.amplifiers[0]!.regulated = true;
		// The hand figures take the solid-formula loop: shorten the runs by the lay factor to match.
		for (const c of d.cables) c.lengthM /= STRANDING_FACTOR;
		const s = solveNetwork(d, AT);
		expect(s.status).toBe('ok');
		const a = s.amplifiers[0]!;
		// The stiff source (1 µΩ) costs ~0.2 mV, inside the last digit.
		expect(a.terminalV).toBeCloseTo(vAmp, 3);
		expect(a.currentA).toBeCloseTo(amps, 1);
		// Exactly the closed form once the source resistance is in the loop:
		const r = s.cables.reduce((sum, c) => sum + c.resistanceOhm, 0) + 1e-6;
		expect(a.terminalV).toBeCloseTo((vs + Math.sqrt(vs * vs - 4 * r * 1800)) / 2, 8);
	});
});

describe('solveNetwork: bus voltage with an alternator in current limit (worked example WE4)', () => {
	// V = [(V_oc + R·I_alt) + √((V_oc + R·I_alt)² − 4·R·P)]/2
	const bus = (banks: ReturnType<typeof bank>[], altA: number, watts: number) =>
		doc({
			nodes: [node('gnd', 'chassis'), node('bus', 'block')],
			banks,
			alternators: altA > 0 ? [alternator('alt', 'bus', 'gnd', altA, { setPointV: 14.4 })] : [],
			amplifiers: [amp('a', 'bus', 'gnd', watts)],
		});

	it('settles at 12.2228 V with 12.7 V / 5 mΩ, 150 A and 3000 W', () => {
		const s = solveNetwork(bus([bank('b', 'bus', 'gnd')], 150, 3000), AT);
		expect(s.nodeVoltages.bus).toBeCloseTo(12.2228, 4);
		expect(s.amplifiers[0]!.currentA).toBeCloseTo(245.44, 2);
		expect(s.banks[0]!.currentA).toBeCloseTo(95.44, 2);
		expect(s.alternators[0]!.mode).toBe('current');
	});

	it('settles at 12.4737 V with two such batteries in parallel', () => {
		const s = solveNetwork(
			bus([bank('b1', 'bus', 'gnd'), bank('b2', 'bus', 'gnd')], 150, 3000),
			AT,
		);
		expect(s.nodeVoltages.bus).toBeCloseTo(12.4737, 4);
		expect(s.amplifiers[0]!.currentA).toBeCloseTo(240.51, 2);
	});

	it('settles at 11.3821 V with the engine off', () => {
		const s = solveNetwork(bus([bank('b', 'bus', 'gnd')], 0, 3000), AT);
		expect(s.nodeVoltages.bus).toBeCloseTo(11.3821, 4);
		expect(s.amplifiers[0]!.currentA).toBeCloseTo(263.57, 2);
	});

	it('settles at 12.9264 V on a 13.2 V / 2 mΩ LiFePO4 bank with 250 A and 5000 W', () => {
		const lfp = bank('b', 'bus', 'gnd', {
			chemistry: 'lfp',
			cellsPerUnit: 4,
			unitResistanceOhm: 0.002,
			stateOfCharge: 0.6,
		});
		const s = solveNetwork(bus([lfp], 250, 5000), AT);
		expect(s.nodeVoltages.bus).toBeCloseTo(12.9264, 4);
		expect(s.amplifiers[0]!.currentA).toBeCloseTo(386.81, 2);
		expect(s.banks[0]!.currentA).toBeCloseTo(136.81, 2);
	});

	it('reports voltage collapse beyond P_max = (V_oc + R·I_alt)²/(4R) = 9045 W instead of a number', () => {
		const s = solveNetwork(bus([bank('b', 'bus', 'gnd')], 150, 12000), AT);
		expect(s.status).toBe('collapse');
		const pMax = (12.7 + 0.005 * 150) ** 2 / (4 * 0.005); // 9045.125 W
		expect(s.solvedDemandFraction * 12000).toBeGreaterThan(pMax * 0.999);
		expect(s.solvedDemandFraction * 12000).toBeLessThanOrEqual(pMax);
	});

	it('holds the set point in voltage mode while the load is below the alternator limit', () => {
		const s = solveNetwork(bus([bank('b', 'bus', 'gnd', { stateOfCharge: 1 })], 300, 1000), AT);
		expect(s.alternators[0]!.mode).toBe('voltage');
		expect(s.nodeVoltages.bus).toBeGreaterThan(14.4 - 0.01);
		expect(s.nodeVoltages.bus).toBeLessThan(14.4);
	});

	it('never shows a charging current above the bank’s acceptance while at the absorption voltage', () => {
		const empty = bank('b', 'bus', 'gnd', { stateOfCharge: 0.2 });
		const s = solveNetwork(bus([empty], 500, 100), AT);
		expect(s.banks[0]!.charging).toBe(true);
		expect(-s.banks[0]!.currentA).toBeLessThanOrEqual(s.banks[0]!.chargeAcceptanceA * (1 + 1e-9));
	});
});

describe('solveNetwork: unequal batteries in parallel (Millman, worked example WE5)', () => {
	it('settles at 12.6231 V with 15.38 A circulating', () => {
		// 12.7 V / 5 mΩ with 12.5 V / 8 mΩ. A generous charge acceptance keeps the weaker battery
		// on its plain internal resistance, as in the linear textbook case.
		const weak = bank('b2', 'bus', 'gnd', {
			stateOfCharge: 0.5 + 0.25 * 0.5,
			unitResistanceOhm: 0.008,
			maxChargeC: 10,
		}); // AGM: 12.5 V
		const s = solveNetwork(
			doc({
				nodes: [node('gnd', 'chassis'), node('bus')],
				banks: [bank('b1', 'bus', 'gnd', { maxChargeC: 10 }), weak],
			}),
			AT,
		);
		expect(s.banks[1]!.ocvV).toBeCloseTo(12.5, 9);
		expect(s.nodeVoltages.bus).toBeCloseTo(12.6231, 4);
		expect(s.banks[0]!.currentA).toBeCloseTo(15.38, 2);
		expect(s.banks[1]!.currentA).toBeCloseTo(-15.38, 2);
	});
});

function kirchhoffResidual(d: BuildDocument, s: ReturnType<typeof solveNetwork>): number {
	const sum = new Map<string, number>(d.nodes.map((n) => [n.id, 0]));
	const add = (id: string, a: number) => sum.set(id, sum.get(id)! + a);
	d.cables.forEach((c, i) => {
		add(c.from, -s.cables[i]!.currentA);
		add(c.to, s.cables[i]!.currentA);
	});
	d.banks.forEach((b, i) => {
		add(b.positive, s.banks[i]!.currentA);
		add(b.negative, -s.banks[i]!.currentA);
	});
	d.alternators.forEach((a, i) => {
		add(a.positive, s.alternators[i]!.currentA);
		add(a.negative, -s.alternators[i]!.currentA);
	});
	d.amplifiers.forEach((a, i) => {
		add(a.positive, -s.amplifiers[i]!.currentA);
		add(a.negative, s.amplifiers[i]!.currentA);
	});
	d.loads.forEach((l, i) => {
		add(l.positive, -s.loads[i]!.currentA);
		add(l.negative, s.loads[i]!.currentA);
	});
	const chassis = d.nodes.find((n) => n.kind === 'chassis')!.id;
	let worst = 0;
	for (const [id, a] of sum) if (id !== chassis) worst = Math.max(worst, Math.abs(a));
	return worst;
}

const seeds = fc.integer({ min: 1, max: 2 ** 31 - 1 });

describe('solveNetwork: laws on generated networks (fast-check)', () => {
	it('satisfies Kirchhoff’s current law at every node', () => {
		fc.assert(
			fc.property(seeds, fc.constantFrom(1 / 8, 1), (seed, demand) => {
				const d = randomNetwork(seed);
				// At a collapse the solution returned is the last stable one (at the solved fraction):
				// the law holds there too.
				const s = solveNetwork(d, { ...AT, engineRpm: 1500, demand });
				// Solver tolerance 1e-8 A; the 1 nS leak to chassis per node adds ~2e-8 A.
				expect(kirchhoffResidual(d, s)).toBeLessThan(1e-6);
			}),
			{ numRuns: 60 },
		);
	});

	it('balances power: sources = loads + cable losses to 1e-6 relative', () => {
		fc.assert(
			fc.property(seeds, (seed) => {
				const s = solveNetwork(randomNetwork(seed), { ...AT, engineRpm: 1500 });
				const { sourcesW, loadsW, cableLossW } = s.power;
				expect(Math.abs(sourcesW - loadsW - cableLossW) / sourcesW).toBeLessThan(1e-6);
			}),
			{ numRuns: 60 },
		);
	});

	it('never lowers a cable’s drop when it gets longer or thinner', () => {
		fc.assert(
			fc.property(
				seeds,
				fc.nat(),
				fc.double({ min: 1.01, max: 3, noNaN: true }),
				fc.boolean(),
				(seed, pick, factor, thinner) => {
					const d = randomNetwork(seed);
					const i = pick % d.cables.length;
					const before = solveNetwork(d, { ...AT, engineRpm: 1500 });
					const changed = structuredClone(d);
					const c = changed.cables[i]!;
					if (thinner) c.size = { kind: 'measured', areaMm2: cableAreaMm2(c.size) / factor };
					else c.lengthM *= factor;
					const after = solveNetwork(changed, { ...AT, engineRpm: 1500 });
					expect(Math.abs(after.cables[i]!.dropV)).toBeGreaterThanOrEqual(
						Math.abs(before.cables[i]!.dropV) - 1e-9,
					);
				},
			),
			{ numRuns: 80 },
		);
	});

	it('never raises an amplifier’s voltage when its single feed gets longer or thinner', () => {
		fc.assert(
			fc.property(
				fc.double({ min: 0.3, max: 8, noNaN: true }),
				fc.double({ min: 1.01, max: 3, noNaN: true }),
				fc.double({ min: 200, max: 4000, noNaN: true }),
				(lengthM, factor, watts) => {
					const one = (len: number, area: number) =>
						doc({
							nodes: [node('gnd', 'chassis'), node('bp'), node('ap'), node('an')],
							banks: [bank('b', 'bp', 'gnd')],
							amplifiers: [amp('a', 'ap', 'an', watts)],
							cables: [
								cable('feed', 'bp', 'ap', { kind: 'measured', areaMm2: area }, len),
								cable('gnd', 'an', 'gnd', { kind: 'measured', areaMm2: area }, 1),
							],
						});
					const base = solveNetwork(one(lengthM, 50), AT).amplifiers[0]!.terminalV;
					expect(
						solveNetwork(one(lengthM * factor, 50), AT).amplifiers[0]!.terminalV,
					).toBeLessThanOrEqual(base + 1e-9);
					expect(
						solveNetwork(one(lengthM, 50 / factor), AT).amplifiers[0]!.terminalV,
					).toBeLessThanOrEqual(base + 1e-9);
				},
			),
			{ numRuns: 60 },
		);
	});

	// Stated for what it means at a collapse: there the reported voltages belong to the largest
	// demand that still solves, so a stronger bank may carry more demand at a slightly lower
	// voltage. The law: the solvable demand never falls, and voltages never fall where both solve.
	it('never lowers an amplifier’s voltage when a bank gains a parallel string (engine off, burp)', () => {
		fc.assert(
			fc.property(seeds, fc.nat(), (seed, pick) => {
				const d = randomNetwork(seed, { banksOnly: true });
				const before = solveNetwork(d, AT);
				const more = structuredClone(d);
				more.banks[pick % more.banks.length]!.stringsInParallel += 1;
				const after = solveNetwork(more, AT);
				expect(after.solvedDemandFraction).toBeGreaterThanOrEqual(
					before.solvedDemandFraction - 1e-9,
				);
				if (before.status === 'ok' && after.status === 'ok')
					before.amplifiers.forEach((a, i) =>
						expect(after.amplifiers[i]!.terminalV).toBeGreaterThanOrEqual(a.terminalV - 1e-9),
					);
			}),
			{ numRuns: 60 },
		);
	});

	it('is deterministic: the same document gives the same numbers', () => {
		const d = randomNetwork(424242);
		expect(solveNetwork(d, AT)).toEqual(solveNetwork(structuredClone(d), AT));
	});
});

describe('solveNetwork: two banks joined by a cable, no load (Millman’s theorem)', () => {
	// Two Thevenin sources in parallel through a series resistance: the loop current is
	// I = (V₁ − V₂)/(R₁ + R₂ + R_cable), and the node between them sits at Millman's
	// V = (V₁/R₁' + V₂/R₂)/(1/R₁' + 1/R₂) with R₁' = R₁ + R_cable. The charging bank presents its
	// own internal resistance: the acceptance only caps the current.
	const pair = (over2: Parameters<typeof bank>[3] = {}) =>
		doc({
			nodes: [node('gnd', 'chassis'), node('p1'), node('p2')],
			banks: [
				bank('full', 'p1', 'gnd', { stateOfCharge: 0.95 }),
				bank('low', 'p2', 'gnd', { stateOfCharge: 0.4, ...over2 }),
			],
			cables: [cable('link', 'p1', 'p2', { kind: 'awg', awg: '4' }, 1)],
		});
	const OFF = { engineRpm: 0, demand: 0, conductorTempC: 20 };

	it('exchanges the current the two internal resistances and the cable allow', () => {
		const d = pair({ maxChargeC: 3 });
		const s = solveNetwork(d, OFF);
		const [full, low] = d.banks.map((b) => bankThevenin(b));
		const rc = s.cables[0]!.resistanceOhm;
		const expected = (full!.ocvV - low!.ocvV) / (full!.resistanceOhm + low!.resistanceOhm + rc);
		expect(expected).toBeGreaterThan(20); // a real exchange, far below what a 3 C bank accepts
		expect(s.banks[0]!.currentA).toBeCloseTo(expected, 4);
		expect(s.banks[1]!.currentA).toBeCloseTo(-expected, 4);
		expect(s.banks[1]!.chargeLimited).toBe(false);
		const r1 = full!.resistanceOhm + rc;
		const millman =
			(full!.ocvV / r1 + low!.ocvV / low!.resistanceOhm) / (1 / r1 + 1 / low!.resistanceOhm);
		expect(s.nodeVoltages.p2).toBeCloseTo(millman, 6);
	});

	it('caps the exchange at the charging bank’s acceptance, and says so', () => {
		const d = pair({ maxChargeC: 0.05 });
		const s = solveNetwork(d, OFF);
		const accept = chargeAcceptanceA(d.banks[1]!);
		expect(accept).toBeLessThan(20);
		expect(s.banks[1]!.currentA).toBeCloseTo(-accept, 6);
		expect(s.banks[0]!.currentA).toBeCloseTo(accept, 3);
		expect(s.banks[1]!.chargeLimited).toBe(true);
		const r = buildReport(d, { engineRpm: 0, sustainedDemand: 0 });
		if (!r.ok) throw new Error('topology');
		expect(r.warnings.find((w) => w.code === 'bank_charge_limited')?.element).toEqual({
			kind: 'bank',
			id: 'low',
		});
		expect(r.banks[1]!.sustainedChargeLimited).toBe(true);
	});
});

describe('solveNetwork: an unregulated amplifier above its rated voltage', () => {
	// Rated 1000 W at 12.6 V, η 1, on a stiff 14.4 V bus: its rails follow the supply, so it gives
	// 1000·(14.4/12.6)² = 1306.1 W and draws 1306.1/14.4 = 90.70 A, not the 1000/14.4 = 69.44 A a
	// constant-power model would size its cable and fuse for.
	const bus = (over: Parameters<typeof amp>[4] = {}) =>
		doc({
			nodes: [node('gnd', 'chassis'), node('bus', 'block')],
			alternators: [
				alternator('alt', 'bus', 'gnd', 5000, { setPointV: 14.4, sourceResistanceOhm: 1e-6 }),
			],
			amplifiers: [amp('a', 'bus', 'gnd', 1000, { ratedVoltageV: 12.6, ...over })],
		});

	it('draws the current its grown output needs', () => {
		const s = solveNetwork(bus(), AT);
		expect(s.amplifiers[0]!.currentA).toBeCloseTo(90.7, 1);
		const r = buildReport(bus(), { engineRpm: 1000 });
		if (!r.ok) throw new Error('topology');
		expect(r.amplifiers[0]!.burpOutputW).toBeCloseTo(1306.1, 0);
		expect(r.amplifiers[0]!.outputModel).toBe('unregulated');
	});

	it('stops growing at a stated maximum output, and a regulated one stays at its rating', () => {
		expect(solveNetwork(bus({ maxOutputW: 1100 }), AT).amplifiers[0]!.currentA).toBeCloseTo(
			1100 / 14.4,
			2,
		);
		expect(solveNetwork(bus({ regulated: true }), AT).amplifiers[0]!.currentA).toBeCloseTo(
			1000 / 14.4,
			2,
		);
	});
});
