import { describe, expect, it } from 'vitest';
import { marlinBuild } from '../../db/demo/builds';
import { mergePlan } from '../../src/engine/merge';
import type { BuildDocument } from '../../src/engine/types';

// Behaviour of the three-way merge used when a plan is installed on a newer head: the plan's
// changes since its base, plus the head's, matched by component id.
const base = marlinBuild;
const edit = (f: (d: BuildDocument) => void) => {
	const d = structuredClone(base);
	f(d);
	return d;
};

describe('mergePlan', () => {
	it('returns the plan itself when the head is the base', () => {
		const plan = edit((d) => (d.cables[0]!.lengthM = 5));
		const r = mergePlan(base, plan, base);
		expect(r).toEqual({ ok: true, document: plan });
	});

	it('keeps the head’s changes and applies the plan’s, additions and removals included', () => {
		const plan = edit((d) => {
			d.cables.find((c) => c.id === 'run')!.size = { kind: 'awg', awg: '4/0' };
			d.loads.push({
				id: 'lights',
				label: 'Show lights',
				positive: 'front_pos',
				negative: 'chassis',
				currentA: 6,
			});
			d.amplifiers = d.amplifiers.filter((a) => a.id !== 'mids');
			d.cables = d.cables.filter((c) => c.id !== 'mids_feed' && c.id !== 'mids_gnd');
			d.nodes = d.nodes.filter((n) => n.id !== 'mids_pos' && n.id !== 'mids_neg');
		});
		const head = edit((d) => {
			d.banks.find((b) => b.id === 'rear')!.stringsInParallel = 3;
			d.loads[0]!.currentA = 30;
		});
		const r = mergePlan(base, plan, head);
		if (!r.ok) throw new Error('expected a merge');
		expect(r.document.banks.find((b) => b.id === 'rear')!.stringsInParallel).toBe(3);
		expect(r.document.loads.map((l) => [l.id, l.currentA])).toEqual([
			['vehicle', 30],
			['lights', 6],
		]);
		expect(r.document.cables.find((c) => c.id === 'run')!.size).toEqual({
			kind: 'awg',
			awg: '4/0',
		});
		expect(r.document.amplifiers.map((a) => a.id)).toEqual(['sub1', 'sub2']);
		expect(r.document.cables.some((c) => c.id === 'mids_feed')).toBe(false);
	});

	it('accepts the same change on both sides, and names a part both changed differently', () => {
		const same = edit((d) => (d.loads[0]!.currentA = 31));
		expect(mergePlan(base, same, same).ok).toBe(true);
		const plan = edit((d) => (d.loads[0]!.currentA = 45));
		const head = edit((d) => (d.loads[0]!.currentA = 33));
		expect(mergePlan(base, plan, head)).toEqual({
			ok: false,
			conflicts: [
				{
					group: 'loads',
					id: 'vehicle',
					label: 'Vehicle electrics',
					plan: 'changed',
					head: 'changed',
				},
			],
		});
		const removedInHead = edit((d) => (d.loads = []));
		expect(mergePlan(base, plan, removedInHead)).toEqual({
			ok: false,
			conflicts: [
				{
					group: 'loads',
					id: 'vehicle',
					label: 'Vehicle electrics',
					plan: 'changed',
					head: 'removed',
				},
			],
		});
	});
});
