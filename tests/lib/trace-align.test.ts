import { describe, expect, it } from 'vitest';
import { alignTrace, burpStartS } from '../../src/lib/trace-align';

const trace = (pts: Array<[number, number]>) => pts.map(([tS, amps]) => ({ tS, volts: 13, amps }));

describe('burpStartS: the 50 % crossing of the current rise (IEEE 181 mid reference level)', () => {
	it('interpolates the crossing between the samples around it', () => {
		// Rest 20 A, peak 420 A: half level 220 A, crossed between 1.0 s (20 A) and 1.1 s (320 A) at
		// 1.0 + 0.1·200/300 = 1.0667 s (hand computation).
		const t = trace([
			[0, 20],
			[0.5, 22],
			[1.0, 20],
			[1.1, 320],
			[1.2, 420],
			[2.0, 410],
			[2.1, 30],
		]);
		expect(burpStartS(t)).toBeCloseTo(1.0 + 0.1 * (200 / 300), 9);
	});

	it('takes the resting draw before the peak, not the tail after the burp', () => {
		const t = trace([
			[0, 60],
			[1, 60],
			[2, 460],
			[3, 5],
		]);
		// Rest 60 (the 5 A tail comes after the peak), half 260: 1 + (200/400) = 1.5 s.
		expect(burpStartS(t)).toBeCloseTo(1.5, 9);
	});

	it('answers the first time of a flat trace or one that starts in the burp, and null when empty', () => {
		expect(
			burpStartS(
				trace([
					[3, 10],
					[4, 12],
					[5, 11],
				]),
			),
		).toBe(3);
		expect(
			burpStartS(
				trace([
					[7, 400],
					[8, 380],
				]),
			),
		).toBe(7);
		expect(burpStartS([])).toBeNull();
	});
});

describe('alignTrace', () => {
	it('shifts time so the start is zero and keeps the last sample when thinning', () => {
		const t = trace(Array.from({ length: 1000 }, (_, i) => [i * 0.01, 10] as [number, number]));
		const a = alignTrace(t, 2.5, 100);
		expect(a[0]!.tS).toBeCloseTo(-2.5, 9);
		expect(a.at(-1)!.tS).toBeCloseTo(9.99 - 2.5, 9);
		expect(a.length).toBeLessThanOrEqual(101);
	});
});

describe('toTraceChartData', () => {
	it('keeps each run’s letter and colour when an earlier run has no trace', async () => {
		const { toTraceChartData, TRACE_SLOTS } =
			await import('../../src/components/runs/trace-comparison-data');
		const t = trace([
			[0, 10],
			[1, 300],
		]);
		const data = toTraceChartData([{ run: {} as never, samples: t, startS: 0, slot: 2 }]);
		expect(data.datasets.map((d) => d.label)).toEqual(['C volts', 'C amps']);
		expect(data.datasets[0]!.borderColor).toBe(TRACE_SLOTS[2]!.colour);
	});
});
