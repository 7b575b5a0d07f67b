import { describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import { computedChecks } from '../../src/engine/checks';
import { buildReport } from '../../src/engine/report';

describe('computedChecks', () => {
	it('fails the fusing item for a known unfused battery cable, naming the cable', () => {
		const d = structuredClone(pebbleBuild);
		d.cables.find((c) => c.id === 'run')!.fuses = [];
		const fusing = computedChecks(buildReport(d, {}, { burpRun: false })).find(
			(c) => c.key === 'battery_fusing',
		)!;
		expect(fusing.status).toBe('fail');
		expect(fusing.reasons.join(' ')).toMatch(/Front-to-rear run/);
	});

	it('passes the fusing item when every battery cable is fused close to the battery', () => {
		const fusing = computedChecks(buildReport(pebbleBuild, {}, { burpRun: false })).find(
			(c) => c.key === 'battery_fusing',
		)!;
		expect(fusing).toMatchObject({ status: 'pass', reasons: [] });
	});

	it('fails an unsecured bank and a flooded bank in the cabin without venting', () => {
		const d = structuredClone(pebbleBuild);
		Object.assign(d.banks[0]!, {
			secured: false,
			chemistry: 'flooded',
			location: 'cabin',
			vented: false,
		});
		const checks = computedChecks(buildReport(d, {}, { burpRun: false }));
		expect(checks.find((c) => c.key === 'batteries_secured')!.status).toBe('fail');
		expect(checks.find((c) => c.key === 'venting')!.status).toBe('fail');
	});

	it('fails one item with the topology issues when the build cannot be solved', () => {
		const d = structuredClone(pebbleBuild);
		d.cables = d.cables.filter((c) => c.id !== 'amp_gnd');
		expect(computedChecks(buildReport(d))).toEqual([
			expect.objectContaining({ key: 'solvable', status: 'fail' }),
		]);
	});
});
