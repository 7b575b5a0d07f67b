import { describe, expect, it } from 'vitest';
import { DEMO_BUILDS } from '../../db/demo/builds';
import { bankChargeTargets } from '../../src/engine/battery';
import { comparePlans } from '../../src/engine/compare';
import { nextSize, upgradeHints } from '../../src/engine/hints';
import { DEFAULT_SCENARIO } from '../../src/engine/report';
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

	it('gives each change the same dB the plan comparison shows for a plan made of it', () => {
		// One truth per figure: the ranked list's dB and the comparison's column for a plan holding
		// the same document are one computation (the weakest amplifier's loss against its rating).
		const at = {
			engineRpm: DEFAULT_SCENARIO.engineRpm,
			demand: DEFAULT_SCENARIO.burpDemand,
			conductorTempC: DEFAULT_SCENARIO.conductorTempC,
		};
		for (const d of Object.values(DEMO_BUILDS)) {
			const hints = upgradeHints(d, at);
			const columns = comparePlans(
				d,
				hints.map((h, i) => ({
					id: String(i),
					name: h.description,
					document: h.document,
					cost: 0,
				})),
			);
			hints.forEach((h, i) => {
				const column = columns.find((c) => c.id === String(i))!;
				expect(column.lowestAmplifierV.burp).toBeCloseTo(h.afterV, 9);
				expect(h.gainDb).not.toBeNull();
				expect(h.gainDb!).toBeCloseTo(column.deltaDb!, 9);
				// A change that gives volts back gives output back, and one that costs volts costs output.
				expect(Math.sign(Math.round(h.gainDb! * 1e6))).toBe(Math.sign(Math.round(h.gainV * 1e6)));
			});
		}
	}, 60_000); // a full comparison per change of every demo build: seconds, not milliseconds

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
