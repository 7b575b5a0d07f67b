import { describe, expect, it } from 'vitest';
import { comparePlans } from '../../src/engine/compare';
import { cableResistanceOhm } from '../../src/engine/conductors';
import { traceFeeds } from '../../src/engine/feed';
import { buildReport } from '../../src/engine/report';
import { solveNetwork } from '../../src/engine/solve';
import type { BuildDocument } from '../../src/engine/types';
import { alternator, amp, bank, cable, doc, node } from '../helpers/networks';

const AT = { engineRpm: 1500, demand: 1, conductorTempC: 25 };
const ok = (d: BuildDocument, s = {}) => {
	const r = buildReport(d, { ...AT, ...s }, { burpRun: false });
	if (!r.ok) throw new Error(JSON.stringify(r.issues));
	return r;
};

/** A bank in the trunk, one amplifier on a 4 AWG feed and a 1/0 return. */
const radial = () =>
	doc({
		nodes: [
			node('gnd', 'chassis'),
			node('bp', 'battery'),
			node('ap', 'amplifier'),
			node('an', 'amplifier'),
		],
		banks: [bank('rear', 'bp', 'gnd')],
		amplifiers: [amp('a', 'ap', 'an', 2000)],
		cables: [
			cable('feed', 'bp', 'ap', { kind: 'awg', awg: '4' }, 3),
			cable('ret', 'an', 'gnd', { kind: 'awg', awg: '1/0' }, 0.5),
		],
	});

describe('the drop along the path that feeds each amplifier', () => {
	it('is the amplifier current times its feed and return resistance when one bank feeds it', () => {
		// Kirchhoff's voltage law round the loop bank + → feed → amplifier → return → bank −, with
		// Ohm's law on each cable: V_bank − V_amp = I·(R_feed + R_return).
		const d = radial();
		const sol = solveNetwork(d, AT);
		const feed = traceFeeds(d, sol).get('a')!;
		expect(feed.kind).toBe('feeding');
		expect(feed.sources).toEqual([expect.objectContaining({ kind: 'bank', id: 'rear', share: 1 })]);
		const r = d.cables.reduce((t, c) => t + cableResistanceOhm(c, AT.conductorTempC), 0);
		const report = ok(d);
		expect(report.amplifiers[0]!.burpDropV).toBeCloseTo(sol.amplifiers[0]!.currentA * r, 9);
		expect(report.amplifiers[0]!.burpDropReference.kind).toBe('feeding');
	});

	it('names the source it measured from in the finding', () => {
		const d = radial();
		const w = ok(d, { dropTargetV: 0.05 }).warnings.find((x) => x.code === 'drop_over_target');
		expect(w?.message).toContain('"rear"');
		expect(w?.message).toContain('feed and return');
	});

	it('weights two banks on their own runs by the current each sends in (proportional sharing)', () => {
		// At a node fed by two branches only, the mix leaving it is the two inflows' ratio (KCL;
		// J. Bialek, "Tracing the flow of electricity", 1996). The reference is then
		// Σ share·V_source, and V_ref − V_amp = Σ share·I_branch·R_branch + I_amp·R_return.
		const d = doc({
			nodes: [
				node('gnd', 'chassis'),
				node('f', 'battery'),
				node('r', 'battery'),
				node('ap', 'amplifier'),
				node('an', 'amplifier'),
			],
			banks: [bank('front', 'f', 'gnd'), bank('back', 'r', 'gnd', { stateOfCharge: 0.6 })],
			amplifiers: [amp('a', 'ap', 'an', 2500)],
			cables: [
				cable('from_front', 'f', 'ap', { kind: 'awg', awg: '4' }, 4),
				cable('from_back', 'r', 'ap', { kind: 'awg', awg: '1/0' }, 1),
				cable('ret', 'an', 'gnd', { kind: 'awg', awg: '1/0' }, 0.5),
			],
		});
		const sol = solveNetwork(d, AT);
		const iFront = sol.cables[0]!.currentA;
		const iBack = sol.cables[1]!.currentA;
		expect(iFront).toBeGreaterThan(0);
		expect(iBack).toBeGreaterThan(0);
		const feed = traceFeeds(d, sol).get('a')!;
		const share = Object.fromEntries(feed.sources.map((s) => [s.id, s.share]));
		expect(share.front).toBeCloseTo(iFront / (iFront + iBack), 9);
		expect(share.back).toBeCloseTo(iBack / (iFront + iBack), 9);
		const expected =
			share.front! * sol.cables[0]!.dropV +
			share.back! * sol.cables[1]!.dropV +
			sol.cables[2]!.dropV;
		expect(feed.referenceV - sol.amplifiers[0]!.terminalV).toBeCloseTo(expected, 9);
	});
});

describe('plan comparison: findings beside the amplifier’s own voltage', () => {
	// An alternator at the front, the bank and one amplifier at the back on a long thin feed: a plan
	// adds a second alternator, which raises the amplifier's voltage while its feed still loses too
	// much. The finding stays; the comparison says the amplifier got better.
	const now = doc({
		nodes: [
			node('gnd', 'chassis'),
			node('alt', 'alternator'),
			node('bp', 'battery'),
			node('ap', 'amplifier'),
			node('an', 'amplifier'),
		],
		alternators: [alternator('one', 'alt', 'gnd', 120)],
		banks: [bank('rear', 'bp', 'gnd')],
		amplifiers: [amp('a', 'ap', 'an', 3000)],
		cables: [
			cable('run', 'alt', 'bp', { kind: 'awg', awg: '1/0' }, 5),
			cable('feed', 'bp', 'ap', { kind: 'awg', awg: '4' }, 4),
			cable('ret', 'an', 'gnd', { kind: 'awg', awg: '1/0' }, 0.5),
		],
	});
	const plan = structuredClone(now);
	plan.alternators.push(alternator('two', 'alt', 'gnd', 120));
	const [base, col] = comparePlans(
		now,
		[{ id: 'p', name: 'Second alternator', document: plan, cost: 0 }],
		{
			engineRpm: 1500,
			conductorTempC: 25,
		},
	);

	it('marks the finding with the rise of the amplifier’s burp voltage', () => {
		const before = base!.amplifiers.find((a) => a.id === 'a')!.burpV;
		const after = col!.amplifiers.find((a) => a.id === 'a')!.burpV;
		expect(after).toBeGreaterThan(before);
		const f = col!.amplifierFindings.find((x) => x.amplifierId === 'a');
		expect(f).toBeDefined();
		expect(f!.changeV).toBeCloseTo(after - before, 12);
		// The current build's column has nothing to compare against.
		expect(base!.amplifierFindings.every((x) => x.changeV === null)).toBe(true);
	});

	it('marks the same finding worse when a plan thins the feed', () => {
		const thin = structuredClone(now);
		thin.cables.find((c) => c.id === 'feed')!.size = { kind: 'awg', awg: '8' };
		const [, worse] = comparePlans(now, [{ id: 't', name: 'Thin', document: thin, cost: 0 }], {
			engineRpm: 1500,
			conductorTempC: 25,
		});
		const f = worse!.amplifierFindings.find((x) => x.amplifierId === 'a');
		expect(f!.changeV).toBeLessThan(0);
	});
});
