import { describe, expect, it } from 'vitest';
import { DEMO_BUILDS } from '../../db/demo/builds';
import { bankChargeTargets } from '../../src/engine/battery';
import { nextSize, upgradeHints } from '../../src/engine/hints';
import { solveNetwork } from '../../src/engine/solve';
import { amp, bank, cable, doc, node } from '../helpers/networks';

const AT = { engineRpm: 1500, demand: 1, conductorTempC: 25 };

describe('upgradeHints', () => {
	it('ranks the one obviously undersized cable first (known by construction)', () => {
		// Everything is 1/0 copper except the amplifier feed, which is 8 AWG for a 2.4 kW draw.
		const d = doc({
			nodes: [
				node('gnd', 'chassis'),
				node('bp', 'battery'),
				node('blk', 'block'),
				node('ap', 'amplifier'),
				node('an', 'amplifier'),
			],
			banks: [bank('b', 'bp', 'gnd', { stringsInParallel: 3, unitResistanceOhm: 0.003 })],
			amplifiers: [amp('a', 'ap', 'an', 2400)],
			cables: [
				cable('run', 'bp', 'blk', { kind: 'awg', awg: '1/0' }, 4),
				cable('feed', 'blk', 'ap', { kind: 'awg', awg: '8' }, 1.5),
				cable('gnd', 'an', 'gnd', { kind: 'awg', awg: '1/0' }, 0.5),
			],
		});
		const hints = upgradeHints(d, AT);
		expect(hints[0]).toMatchObject({ kind: 'upsize_cable', targetId: 'feed' });
		expect(hints[0]!.gainV).toBeGreaterThan(0.1);
		for (let i = 1; i < hints.length; i++)
			expect(hints[i]!.gainV).toBeLessThanOrEqual(hints[i - 1]!.gainV);
	});

	it('reports gains that equal separate engine runs of the changed documents', () => {
		const base = Math.min(
			...solveNetwork(DEMO_BUILDS.Marlin, AT).amplifiers.map((a) => a.terminalV),
		);
		for (const h of upgradeHints(DEMO_BUILDS.Marlin, AT)) {
			expect(h.beforeV).toBeCloseTo(base, 9);
			const after = Math.min(...solveNetwork(h.document, AT).amplifiers.map((a) => a.terminalV));
			expect(h.afterV).toBeCloseTo(after, 9);
		}
	});

	it('never raises a regulator past any bank’s charge limit', () => {
		for (const d of Object.values(DEMO_BUILDS)) {
			for (const h of upgradeHints(d, AT).filter((x) => x.kind === 'raise_set_point')) {
				for (const a of h.document.alternators)
					for (const b of h.document.banks)
						expect(a.setPointV).toBeLessThanOrEqual(bankChargeTargets(b).maxV);
			}
		}
	});
});

describe('nextSize', () => {
	it('steps AWG up one size and adds a run past 4/0', () => {
		const c = cable('c', 'a', 'b', { kind: 'awg', awg: '4' }, 1);
		expect(nextSize(c).size).toEqual({ kind: 'awg', awg: '2' });
		expect(nextSize({ ...c, size: { kind: 'awg', awg: '4/0' } })).toEqual({
			size: { kind: 'awg', awg: '4/0' },
			parallelRuns: 2,
		});
	});

	it('steps metric cables to the next IEC 60228 nominal size', () => {
		expect(nextSize(cable('c', 'a', 'b', { kind: 'mm2', mm2: 35 }, 1)).size).toEqual({
			kind: 'mm2',
			mm2: 50,
		});
		expect(nextSize(cable('c', 'a', 'b', { kind: 'measured', areaMm2: 18.2 }, 1)).size).toEqual({
			kind: 'mm2',
			mm2: 25,
		});
	});
});
