import { describe, expect, it } from 'vitest';
import { runVoltage } from '../../src/lib/run-figures';
import { dbAgainstVolts } from '../../src/components/runs/trace-comparison-data';
import { toScoreVsVoltage } from '../../src/components/runs/run-chart-data';
import type { RunDto } from '../../src/lib/schemas/runs';

const run = (over: Partial<RunDto>): RunDto =>
	({
		id: crypto.randomUUID(),
		vehicleId: crypto.randomUUID(),
		vehicleName: 'Test',
		eventId: null,
		eventName: null,
		revisionId: null,
		revisionNumber: null,
		ranAt: '2026-06-01T10:00:00.000Z',
		ranAtOffsetMin: 0,
		scoreDb: null,
		frequencyHz: null,
		restingV: null,
		minV: null,
		notes: '',
		hasLogger: false,
		logger: null,
		mismatches: [],
		...over,
	}) as RunDto;

describe('a run’s voltages come from its logger file where it has one', () => {
	it('shows the logger’s figure and keeps the typed one beside when they differ', () => {
		const r = run({ minV: 12.5, restingV: 12.9, logger: { minV: 11.56, restingV: 12.9 } });
		expect(runVoltage(r, 'minV')).toEqual({ value: 11.56, fromLogger: true, typed: 12.5 });
		expect(runVoltage(r, 'restingV')).toEqual({ value: 12.9, fromLogger: true, typed: null });
	});

	it('falls back to the typed figure without a file, and to it when the file has no resting part', () => {
		expect(runVoltage(run({ minV: 11.8 }), 'minV')).toEqual({
			value: 11.8,
			fromLogger: false,
			typed: null,
		});
		const noRest = run({ restingV: 12.7, logger: { minV: 11.2, restingV: null } });
		expect(runVoltage(noRest, 'restingV').value).toBe(12.7);
	});

	// 20·log10(V_B/V_A) with the logger minima: 20·log10(11.56/11.56) = 0 dB. With the typed 12.5 V
	// it would read 20·log10(11.56/12.5) = −0.679 dB, a change the logger does not show.
	it('gives the comparison’s "from the volts" dB from the logger minima', () => {
		const a = run({ scoreDb: 150, minV: 12.5, logger: { minV: 11.56, restingV: 12.8 } });
		const b = run({ scoreDb: 150.1, minV: 11.55, logger: { minV: 11.56, restingV: 12.8 } });
		const [row] = dbAgainstVolts([a, b]);
		expect(row!.expectedDb).toBeCloseTo(0, 9);
		expect(row!.measuredDb).toBeCloseTo(0.1, 9);
	});

	it('plots the score against the logger minimum', () => {
		const a = run({ scoreDb: 148, minV: 12.5, logger: { minV: 11.56, restingV: null } });
		const data = toScoreVsVoltage([a], a);
		expect((data.datasets[0]!.data as { x: number }[])[0]!.x).toBe(11.56);
		expect(String(data.datasets[1]!.label)).toContain('11.56');
	});
});
