import { describe, expect, it } from 'vitest';
import { DEMO_BUILDS, pebbleBuild } from '../../db/demo/builds';
import { parseBuildDocument } from '../../src/engine';
import { amp, cable, doc, node } from '../helpers/networks';

type Mutable = Record<string, any>;
const mutate = (change: (d: Mutable) => void) => {
	const d = structuredClone(pebbleBuild) as Mutable;
	change(d);
	return parseBuildDocument(d);
};
const problemsOf = (r: ReturnType<typeof parseBuildDocument>) => (r.ok ? [] : r.problems);

describe('parseBuildDocument', () => {
	it.each(Object.keys(DEMO_BUILDS))('accepts the demo build %s', (name) => {
		expect(parseBuildDocument(DEMO_BUILDS[name as keyof typeof DEMO_BUILDS])).toMatchObject({
			ok: true,
		});
	});

	it.each([
		['NaN length', (d: Mutable) => (d.cables[0].lengthM = Number.NaN), 'cables.0.lengthM'],
		[
			'infinite length',
			(d: Mutable) => (d.cables[1].lengthM = Number.POSITIVE_INFINITY),
			'cables.1.lengthM',
		],
		['negative length', (d: Mutable) => (d.cables[2].lengthM = -1), 'cables.2.lengthM'],
		[
			'zero efficiency',
			(d: Mutable) => (d.amplifiers[0].efficiency = 0),
			'amplifiers.0.efficiency',
		],
		[
			'efficiency above 1',
			(d: Mutable) => (d.amplifiers[0].efficiency = 1.2),
			'amplifiers.0.efficiency',
		],
		[
			'unknown AWG size',
			(d: Mutable) => (d.cables[0].size = { kind: 'awg', awg: '5' }),
			'cables.0.size.awg',
		],
		['unknown material', (d: Mutable) => (d.cables[0].material = 'silver'), 'cables.0.material'],
		[
			'state of charge above 1',
			(d: Mutable) => (d.banks[0].stateOfCharge = 1.5),
			'banks.0.stateOfCharge',
		],
		['dangling cable end', (d: Mutable) => (d.cables[3].to = 'nowhere'), 'cables.3.to'],
		[
			'dangling amplifier terminal',
			(d: Mutable) => (d.amplifiers[0].positive = 'ghost'),
			'amplifiers.0.positive',
		],
		['a cable onto itself', (d: Mutable) => (d.cables[0].to = d.cables[0].from), 'cables.0.to'],
		['no chassis node', (d: Mutable) => (d.nodes[0].kind = 'junction'), 'nodes'],
		['two chassis nodes', (d: Mutable) => (d.nodes[1].kind = 'chassis'), 'nodes'],
		['duplicate node id', (d: Mutable) => (d.nodes[2].id = d.nodes[1].id), 'nodes.2.id'],
		[
			'two fuses at one end',
			(d: Mutable) => d.cables[3].fuses.push({ ...d.cables[3].fuses[0] }),
			'cables.3.fuses',
		],
		[
			'a string where a number belongs',
			(d: Mutable) => (d.amplifiers[0].ratedPowerW = '1500'),
			'amplifiers.0.ratedPowerW',
		],
		['another schema version', (d: Mutable) => (d.schemaVersion = 2), 'schemaVersion'],
	])('refuses %s, naming the field', (_what, change, path) => {
		const problems = problemsOf(mutate(change));
		expect(problems.map((p) => p.path)).toContain(path);
		for (const p of problems) expect(p.message.length).toBeGreaterThan(5);
	});

	it('refuses a node not connected to the chassis through cables or sources', () => {
		const r = mutate((d) => {
			d.nodes.push({ id: 'island', label: 'Loose block', kind: 'block' });
		});
		expect(problemsOf(r)).toEqual([
			expect.objectContaining({
				path: `nodes.${pebbleBuild.nodes.length}`,
				message: expect.stringMatching(/not connected to the chassis/),
			}),
		]);
	});

	it('refuses an amplifier on an island no source feeds', () => {
		const d = doc({
			nodes: [node('gnd', 'chassis'), node('blk'), node('an')],
			amplifiers: [amp('a', 'blk', 'an', 500)],
			cables: [
				cable('c1', 'blk', 'gnd', { kind: 'awg', awg: '4' }, 1),
				cable('c2', 'an', 'gnd', { kind: 'awg', awg: '4' }, 1),
			],
		});
		expect(problemsOf(parseBuildDocument(d))).toEqual([
			expect.objectContaining({
				path: 'amplifiers.0.positive',
				message: expect.stringMatching(/Nothing feeds/),
			}),
		]);
	});

	it('refuses input that is not an object at all', () => {
		expect(parseBuildDocument('hello').ok).toBe(false);
		expect(parseBuildDocument(null).ok).toBe(false);
	});
});
