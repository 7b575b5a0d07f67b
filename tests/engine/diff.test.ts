import { describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import { diffBuilds } from '../../src/engine/diff';

describe('diffBuilds', () => {
	it('finds nothing between a document and its copy', () => {
		expect(diffBuilds(pebbleBuild, structuredClone(pebbleBuild))).toEqual([]);
	});

	it('lists added, removed and changed components with the fields that differ', () => {
		const next = structuredClone(pebbleBuild);
		next.cables[0]!.fuses = [];
		next.cables.find((c) => c.id === 'run')!.lengthM = 6;
		next.loads = [];
		next.nodes.push({ id: 'blk2', label: 'Second block', kind: 'block' });
		const changes = diffBuilds(pebbleBuild, next);
		expect(changes.map((c) => `${c.kind}:${c.group}:${c.id}`)).toEqual([
			'added:nodes:blk2',
			'removed:loads:vehicle',
			'changed:cables:charge',
			'changed:cables:run',
		]);
		const charge = changes.find((c) => c.id === 'charge')!;
		expect(charge.fields.map((f) => f.field)).toEqual([
			'fuses.0.distanceM',
			'fuses.0.end',
			'fuses.0.ratingA',
		]);
		expect(changes.find((c) => c.id === 'run')!.fields).toEqual([
			{ field: 'lengthM', before: pebbleBuild.cables[3]!.lengthM, after: 6 },
		]);
	});
});
