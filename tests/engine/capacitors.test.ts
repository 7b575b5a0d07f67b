import { describe, expect, it } from 'vitest';
import { bankThevenin } from '../../src/engine/battery';
import { runBurp } from '../../src/engine/burp';
import {
	beginCapacitorStep,
	capacitorBranchA,
	capacitorTotals,
	endCapacitorStep,
} from '../../src/engine/capacitor';
import { parseBuildDocument } from '../../src/engine/document-schema';
import { compileNetwork } from '../../src/engine/network';
import { solveCompiled } from '../../src/engine/solver';
import { buildReport } from '../../src/engine/report';
import { runSession } from '../../src/engine/session';
import { solveNetwork } from '../../src/engine/solve';
import type { CapacitorBank } from '../../src/engine/types';
import {
	alternator,
	amp,
	bank,
	cable,
	doc,
	node,
	steady,
	withCapacitorBank,
} from '../helpers/networks';

const module = (over: Partial<CapacitorBank> = {}): CapacitorBank => ({
	id: 'cap',
	label: 'Caps',
	positive: 'bus',
	negative: 'chassis',
	moduleFarads: 300,
	moduleEsrOhm: 0.002,
	moduleRatedV: 2.7,
	moduleLeakageA: 0.004,
	inSeries: 6,
	inParallel: 2,
	...over,
});

/** A bank and a capacitor bank on one node, with a steady load there. */
const busWith = (cap: CapacitorBank, loadA: number) =>
	doc({
		nodes: [node('chassis', 'chassis'), node('bus', 'battery')],
		banks: [bank('b', 'bus', 'chassis')],
		loads: [steady('l', 'bus', 'chassis', loadA)],
		capacitors: [cap],
	});

const running = { engineRpm: 1500, demand: 1, conductorTempC: 25 };

describe('capacitor banks', () => {
	// Series and parallel combination of capacitors and resistances (Hayt & Kemmerly, Engineering
	// Circuit Analysis, ch. 7): 6 in series × 2 strings of 300 F, 2 mΩ, 2.7 V modules.
	it('combines its modules in series and parallel', () => {
		const t = capacitorTotals(module());
		expect(t.farads).toBeCloseTo((300 * 2) / 6, 9);
		expect(t.esrOhm).toBeCloseTo((0.002 * 6) / 2, 12);
		expect(t.ratedV).toBeCloseTo(16.2, 9);
		// Leakage as V_rated / I_leak per module: 675 Ω each, 6 in series, 2 strings.
		expect(t.leakageOhm).toBeCloseTo((675 * 6) / 2, 6);
	});

	it('at a steady point carries only its leakage', () => {
		const d = busWith(module(), 10);
		const s = solveNetwork(d, running);
		const v = s.nodeVoltages.bus!;
		expect(s.capacitors[0]!.currentA).toBeCloseTo(-v / 2025, 9);
		expect(s.capacitors[0]!.capacitorV).toBeCloseTo(v, 9);
	});

	// The step response of a first-order RC circuit (Hayt & Kemmerly, ch. 8): a bank (E, R_b) and a
	// capacitor charged to E behind its series resistance r share a load current I switched on at
	// t = 0. The capacitor's current is I·R_b/(R_b + r)·e^(−t/τ), τ = (R_b + r)·C. The companion
	// model's backward-Euler steps converge to it as the step shrinks.
	it('discharges as the first-order RC circuit does', () => {
		const cap = module();
		const d = busWith(cap, 200);
		const th = bankThevenin(d.banks[0]!, d.banks[0]!.stateOfCharge);
		const { farads, esrOhm } = capacitorTotals(cap);
		const tau = (th.resistanceOhm + esrOhm) * farads;
		const i0 = (200 * th.resistanceOhm) / (th.resistanceOhm + esrOhm);
		const net = compileNetwork(d, running);
		const c = net.capacitors[0]!;
		const at = (v: Float64Array, i: number) => (i < 0 ? 0 : v[i]!);
		for (const [steps, tol] of [
			[200, 5e-3],
			[2000, 5e-4],
		] as const) {
			c.vcV = th.ocvV;
			const dt = tau / steps;
			beginCapacitorStep(net.capacitors, dt);
			let iAtTau = 0;
			for (let k = 1; k <= steps; k++) {
				const { v } = solveCompiled(net);
				const x = at(v, c.p) - at(v, c.n);
				if (k === steps) iAtTau = -capacitorBranchA(c, x);
				endCapacitorStep(net.capacitors, () => x, dt);
			}
			expect(Math.abs(iAtTau - i0 / Math.E) / (i0 / Math.E)).toBeLessThan(tol);
		}
	});

	it('carries the first milliseconds of a burp and lifts the lowest amplifier voltage', () => {
		const base = doc({
			nodes: [
				node('chassis', 'chassis'),
				node('front', 'battery'),
				node('amp_pos', 'amplifier'),
				node('alt', 'alternator'),
			],
			banks: [bank('front', 'front', 'chassis')],
			alternators: [alternator('alt', 'alt', 'chassis', 120)],
			amplifiers: [amp('a', 'amp_pos', 'chassis', 3000)],
			cables: [
				cable('charge', 'alt', 'front', { kind: 'awg', awg: '1/0' }, 1),
				cable('feed', 'front', 'amp_pos', { kind: 'awg', awg: '4' }, 5),
			],
		});
		const withCaps = withCapacitorBank(base);
		expect(parseBuildDocument(withCaps)).toMatchObject({ ok: true });
		const opts = { ...running, durationS: 1, stepS: 0.005 };
		const plain = runBurp(base, opts);
		const capped = runBurp(withCaps, opts);
		expect(capped.minAmplifierV[0]!).toBeGreaterThan(plain.minAmplifierV[0]! + 0.05);
		const seen = capped.capacitors.cap!;
		expect(seen.startV).toBeGreaterThan(seen.minV);
		expect(seen.peakA).toBeGreaterThan(10);
		expect(capped.capacitorShareFirst100ms!).toBeGreaterThan(0.05);
		expect(capped.capacitorShareFirst100ms!).toBeLessThan(1);
		expect(capped.energyWh.capacitors).toBeGreaterThan(0);
		expect(plain.capacitorShareFirst100ms).toBeNull();
		// Through a session it discharges in each burp and recharges in the rests.
		const session = runSession(withCaps, { engineRpm: 1500, burps: 3 });
		const bare = runSession(base, { engineRpm: 1500, burps: 3 });
		expect(session.burps[0]!.lowestAmplifierV!).toBeGreaterThan(bare.burps[0]!.lowestAmplifierV!);
	});

	// The rated voltage adds along a string; a bank charged above it is over its rating
	// (the modules' makers' limit).
	it('finds a bank charged above its rating, and names its share of the burp', () => {
		const base = doc({
			nodes: [node('chassis', 'chassis'), node('front', 'battery'), node('amp_pos', 'amplifier')],
			banks: [bank('front', 'front', 'chassis')],
			alternators: [alternator('alt', 'front', 'chassis', 150, { setPointV: 14.4 })],
			amplifiers: [amp('a', 'amp_pos', 'chassis', 2000)],
			cables: [cable('feed', 'front', 'amp_pos', { kind: 'awg', awg: '4' }, 4)],
		});
		const codes = (inSeries: number) => {
			const r = buildReport(withCapacitorBank(base, { inSeries }));
			if (!r.ok) throw new Error('no report');
			return r.warnings.filter((w) => w.element.kind === 'capacitor').map((w) => w.code);
		};
		// 5 × 2.7 V = 13.5 V under a 14.4 V regulator; 6 × 2.7 V = 16.2 V above it.
		expect(codes(5)).toContain('capacitor_over_rating');
		expect(codes(6)).not.toContain('capacitor_over_rating');
		expect(codes(6)).toContain('capacitor_burp_share');
	});
});
