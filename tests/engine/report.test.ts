import { describe, expect, it } from 'vitest';
import { DEMO_BUILDS, marlinBuild, pebbleBuild } from '../../db/demo/builds';
import { fixedVoltageBudget } from '../../src/engine/budget';
import { runBurp } from '../../src/engine/burp';
import { amplifierCurrentA } from '../../src/engine/amplifier';
import { peukertHours } from '../../src/engine/battery';
import { buildReport, DEFAULT_SCENARIO, type ReportWarning } from '../../src/engine/report';
import { solveNetwork } from '../../src/engine/solve';
import type { BuildDocument } from '../../src/engine/types';
import { alternator, amp, bank, cable, doc, node } from '../helpers/networks';

const codes = (ws: ReportWarning[]) => ws.map((w) => `${w.code}:${w.element.id}`);
const ok = (d: BuildDocument, s = {}) => {
	const r = buildReport(d, s);
	if (!r.ok) throw new Error(JSON.stringify(r.issues));
	return r;
};

/** A bank in the trunk feeding one amplifier through a fused 1/0 run. */
function simple(
	over: {
		fuseA?: number | null;
		fuseIn?: number;
		awg?: '8' | '4' | '1/0';
		watts?: number;
		setPointV?: number;
	} = {},
) {
	const fuses =
		over.fuseA === null
			? []
			: [
					{
						ratingA: over.fuseA ?? 200,
						end: 'from' as const,
						distanceM: (over.fuseIn ?? 8) * 0.0254,
					},
				];
	return doc({
		nodes: [
			node('gnd', 'chassis'),
			node('bp', 'battery'),
			node('ap', 'amplifier'),
			node('an', 'amplifier'),
		],
		banks: [bank('b', 'bp', 'gnd')],
		alternators: [alternator('alt', 'bp', 'gnd', 200, { setPointV: over.setPointV ?? 14.4 })],
		amplifiers: [
			amp('a', 'ap', 'an', over.watts ?? 1500, {
				efficiency: 0.8,
				ratedPowerW: (over.watts ?? 1500) * 0.8,
			}),
		],
		cables: [
			cable('feed', 'bp', 'ap', { kind: 'awg', awg: over.awg ?? '1/0' }, 1.5, { fuses }),
			cable('gnd', 'an', 'gnd', { kind: 'awg', awg: over.awg ?? '1/0' }, 0.5),
		],
	});
}

describe('buildReport', () => {
	it('refuses an unsolvable topology with the issues instead of numbers', () => {
		const d = simple();
		d.cables.pop(); // the amplifier's ground: its negative terminal now floats
		const r = buildReport(d);
		expect(r).toEqual({
			ok: false,
			issues: [expect.objectContaining({ code: 'not_connected', path: 'nodes.3' })],
		});
	});

	it('uses the default supply voltages 12.0, 12.6, 13.8, 14.4 and 16.0 V', () => {
		expect(ok(simple()).budget.map((row) => row.voltageV)).toEqual([12.0, 12.6, 13.8, 14.4, 16.0]);
	});

	it('flags a battery cable with no fuse at the battery end (safety)', () => {
		const w = ok(simple({ fuseA: null })).warnings.find((x) => x.code === 'unfused_battery_cable');
		expect(w).toMatchObject({
			severity: 'danger',
			safety: true,
			element: { kind: 'cable', id: 'feed' },
		});
	});

	it('flags a fuse further from the battery than the team allows (18 in: common practice)', () => {
		expect(codes(ok(simple({ fuseIn: 30 })).warnings)).toContain('fuse_too_far:feed');
		expect(codes(ok(simple({ fuseIn: 12 })).warnings)).not.toContain('fuse_too_far:feed');
		expect(codes(ok(simple({ fuseIn: 12 }), { fuseDistanceM: 0.2 }).warnings)).toContain(
			'fuse_too_far:feed',
		);
	});

	it('flags a fuse above 150 % of what the cable may carry (33 CFR 183.455(c))', () => {
		// 8 AWG at 105 °C: 80 A, so anything over 120 A fails to protect it.
		const r = ok(simple({ awg: '8', fuseA: 150, watts: 600 }));
		expect(codes(r.warnings)).toContain('fuse_above_capacity:feed');
		expect(r.cables[0]!.fuseAdvice).toMatchObject({ status: 'ok', maxA: 120 });
	});

	it('says the cable is too small when no standard fuse fits, and not for ground cables', () => {
		const r = ok(simple({ awg: '8', watts: 3000, fuseA: 300 }));
		expect(codes(r.warnings)).toContain('cable_too_small:feed');
		expect(r.cables[1]!.side).toBe('return');
		expect(r.cables[1]!.fuseAdvice).toBeNull();
	});

	it('flags a drop over the team target at the amplifier', () => {
		const d = simple({ awg: '4', watts: 2500 });
		d.cables[0]!.lengthM = 6;
		expect(codes(ok(d).warnings)).toContain('drop_over_target:a');
		expect(codes(ok(d, { dropTargetV: 5 }).warnings)).not.toContain('drop_over_target:a');
	});

	it('flags a regulator above the chemistry’s charge limit and below its float voltage', () => {
		// AGM: 2.45 V/cell limit → 14.7 V; float 2.27 V/cell → 13.62 V.
		expect(codes(ok(simple({ setPointV: 15.2 })).warnings)).toContain('charge_voltage_high:b');
		expect(codes(ok(simple({ setPointV: 13.4 })).warnings)).toContain('charge_voltage_low:b');
		expect(
			codes(ok(simple({ setPointV: 14.4 })).warnings).filter((c) => c.startsWith('charge_voltage')),
		).toEqual([]);
	});

	it('flags voltage collapse when demand is beyond the sources', () => {
		const r = ok(simple({ watts: 60000, awg: '1/0', fuseA: 500 }));
		expect(r.burp.status).toBe('collapse');
		expect(codes(r.warnings)).toContain('voltage_collapse:build');
	});

	it('flags an unsecured bank and an unvented flooded bank in the cabin', () => {
		const d = simple();
		d.banks[0] = {
			...d.banks[0]!,
			chemistry: 'flooded',
			location: 'cabin',
			vented: false,
			secured: false,
		};
		expect(codes(ok(d).warnings)).toEqual(
			expect.arrayContaining(['bank_not_secured:b', 'flooded_unvented:b']),
		);
	});

	it('gives the same network numbers as separate engine runs', () => {
		const r = ok(marlinBuild);
		expect(r.burp).toEqual(
			solveNetwork(marlinBuild, {
				engineRpm: DEFAULT_SCENARIO.engineRpm,
				demand: 1,
				conductorTempC: DEFAULT_SCENARIO.conductorTempC,
			}),
		);
	});

	it.each(Object.keys(DEMO_BUILDS))(
		'solves the demo build %s at sustained and burp demand',
		(name) => {
			const r = ok(DEMO_BUILDS[name as keyof typeof DEMO_BUILDS]);
			expect(r.sustained.status).toBe('ok');
			expect(r.burp.status).toBe('ok');
			for (const a of r.amplifiers)
				expect(a.burpTerminalV).toBeLessThanOrEqual(a.sustainedTerminalV);
		},
	);
});

describe('fixedVoltageBudget', () => {
	it('sums I = d·P/(η·V) over amplifiers plus steady loads at each voltage', () => {
		const rows = fixedVoltageBudget(pebbleBuild, {
			voltagesV: [12, 14.4],
			engineRpm: 0,
			sustainedDemand: 1 / 8,
			burpDemand: 1,
			cutoffV: null,
		});
		const mono = pebbleBuild.amplifiers[0]!;
		const steadyA = pebbleBuild.loads[0]!.currentA;
		expect(rows[0]!.burpDemandA).toBeCloseTo(amplifierCurrentA(mono, 1, 12) + steadyA, 9);
		expect(rows[1]!.sustainedDemandA).toBeCloseTo(
			amplifierCurrentA(mono, 1 / 8, 14.4) + steadyA,
			9,
		);
		expect(rows[0]!.alternatorSupplyA).toBe(0);
		expect(rows[0]!.burpSurplusA).toBeLessThan(0);
		expect(rows[0]!.burpCarrySeconds).toBeGreaterThan(0);
	});

	it('carries a deficit for the Peukert time of the usable charge (one bank, no resistance)', () => {
		const d = doc({
			nodes: [node('gnd', 'chassis'), node('p')],
			banks: [bank('b', 'p', 'gnd', { stateOfCharge: 1, unitResistanceOhm: 1e-9, peukertK: 1.2 })],
			amplifiers: [amp('a', 'p', 'gnd', 600)], // 50 A at 12 V
		});
		const [row] = fixedVoltageBudget(d, {
			voltagesV: [12],
			engineRpm: 0,
			sustainedDemand: 1,
			burpDemand: 1,
			cutoffV: 12.0,
		});
		expect(row!.sustainedCarryHours).toBeCloseTo(peukertHours(100, 20, 50, 1.2), 6); // 1.262 h
	});

	it('reports no carry time when the alternators keep up', () => {
		const rows = fixedVoltageBudget(simple({ watts: 400 }), {
			voltagesV: [14.4],
			engineRpm: 3000,
			sustainedDemand: 1 / 8,
			burpDemand: 1,
			cutoffV: null,
		});
		expect(rows[0]!.sustainedSurplusA).toBeGreaterThan(0);
		expect(rows[0]!.sustainedCarryHours).toBeNull();
	});
});

describe('runBurp', () => {
	it('steps the burp, lowers the banks’ charge and never raises the minimum voltage over time (engine off)', () => {
		const run = runBurp(pebbleBuild, {
			engineRpm: 0,
			demand: 1,
			conductorTempC: 25,
			durationS: 10,
			stepS: 0.01,
		});
		expect(run.timeS).toHaveLength(1000);
		expect(run.timeS.at(-1)).toBeCloseTo(10, 9);
		for (let i = 1; i < run.minAmplifierV.length; i++)
			expect(run.minAmplifierV[i]!).toBeLessThanOrEqual(run.minAmplifierV[i - 1]! + 1e-9);
		for (const b of pebbleBuild.banks) expect(run.endSoc[b.id]!).toBeLessThan(run.startSoc[b.id]!);
		expect(run.amplifierMinV.mono).toBeCloseTo(Math.min(...run.minAmplifierV), 9);
	});

	it('accounts for energy: banks + alternators = amplifiers + cable loss', () => {
		const run = runBurp(marlinBuild, {
			engineRpm: 1500,
			demand: 1,
			conductorTempC: 25,
			durationS: 5,
			stepS: 0.01,
		});
		const { amplifiers, banks, alternators, cableLoss } = run.energyWh;
		const loadsWh = amplifiers + cableLoss;
		// The vehicle's steady load is the remainder: 28 A at about 12.4 V for 5 s.
		expect(banks + alternators - loadsWh).toBeGreaterThan(0);
		expect(banks + alternators - loadsWh).toBeLessThan((28 * 13 * 5) / 3600);
	});

	it('draws the charge Peukert’s law predicts from a single resistance-free bank', () => {
		const d = doc({
			nodes: [node('gnd', 'chassis'), node('p')],
			banks: [bank('b', 'p', 'gnd', { stateOfCharge: 1, unitResistanceOhm: 1e-6, peukertK: 1.2 })],
			amplifiers: [amp('a', 'p', 'gnd', 1280)], // ~100 A at 12.8 V
		});
		const run = runBurp(d, {
			engineRpm: 0,
			demand: 1,
			conductorTempC: 20,
			durationS: 60,
			stepS: 0.01,
		});
		const used = run.startSoc.b! - run.endSoc.b!;
		const amps = 1280 / 12.8;
		const expected = (amps * (amps / 5) ** 0.2 * 60) / 3600 / 100; // I·(I/I_20)^(k−1)·t / C
		expect(used).toBeCloseTo(expected, 4);
	});
});
