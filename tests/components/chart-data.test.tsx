// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import { toBudgetChartData, toBurpChartData } from '@/components/builds/chart-data';
import { toScoresOverTime, toScoreVsVoltage } from '@/components/runs/run-chart-data';
import type { BudgetRow, BurpRun } from '@/engine';
import type { RunDto } from '@/lib/schemas/runs';

const row = (voltageV: number, alternatorSupplyA: number): BudgetRow =>
	({
		voltageV,
		sustainedDemandA: 120,
		burpDemandA: 400,
		alternatorSupplyA,
		sustainedSurplusA: alternatorSupplyA - 120,
		burpCarrySeconds: null,
	}) as BudgetRow;

function burpRun(steps: number): BurpRun {
	const timeS = Array.from({ length: steps }, (_, i) => i * 0.01);
	return {
		timeS,
		minAmplifierV: timeS.map((t) => 14 - t),
		bankV: { front: timeS.map((t) => 14.2 - t), rear: timeS.map((t) => 14.1 - t) },
	} as unknown as BurpRun;
}

const run = (over: Partial<RunDto>): RunDto => ({
	id: crypto.randomUUID(),
	vehicleId: 'v',
	vehicleName: 'Demo',
	eventId: null,
	eventName: null,
	revisionId: 'r1',
	revisionNumber: 1,
	ranAt: '2026-06-01T10:00:00Z',
	scoreDb: null,
	frequencyHz: null,
	restingV: null,
	minV: null,
	ambientC: null,
	notes: '',
	hasLogger: false,
	ranAtOffsetMin: 0,
	logger: null,
	mismatches: [],
	...over,
});

describe('budget chart data', () => {
	it('has one label and one point per supply voltage, in the order given', () => {
		const data = toBudgetChartData([row(12, 90), row(13.5, 140), row(14.4, 160)]);
		expect(data.labels).toEqual(['12.0 V', '13.5 V', '14.4 V']);
		expect(data.datasets.map((d) => d.data.length)).toEqual([3, 3, 3]);
		expect(data.datasets[0]!.data).toEqual([90, 140, 160]);
	});
});

describe('burp chart data', () => {
	it('thins a long run to about 200 points and keeps its last step', () => {
		const data = toBurpChartData(burpRun(1001), { front: 'Front bank', rear: 'Rear bank' }, null);
		expect(data.labels.length).toBeLessThanOrEqual(202);
		expect(data.labels.at(-1)).toBe('10.0');
		for (const d of data.datasets) expect(d.data.length).toBe(data.labels.length);
	});

	it('gives each bank its own named series, and the drop rule only when there is one', () => {
		const without = toBurpChartData(burpRun(50), { front: 'Front bank', rear: 'Rear bank' }, null);
		expect(without.datasets.map((d) => d.label)).toEqual([
			'Lowest amplifier (V)',
			'Front bank (V)',
			'Rear bank (V)',
		]);
		const withRule = toBurpChartData(
			burpRun(50),
			{ front: 'Front bank', rear: 'Rear bank' },
			13.25,
		);
		expect(withRule.datasets.at(-1)!.label).toBe('Drop target (13.25 V)');
		expect(new Set(withRule.datasets.at(-1)!.data)).toEqual(new Set([13.25]));
	});

	it('draws two banks in different colours and dashes, and starts the axis just below the lowest line', () => {
		const data = toBurpChartData(burpRun(50), { front: 'Front bank', rear: 'Rear bank' }, null);
		const [front, rear] = data.datasets.slice(1) as Array<{
			borderColor: string;
			borderDash: number[];
		}>;
		expect(front!.borderColor).not.toBe(rear!.borderColor);
		expect(front!.borderDash).not.toEqual(rear!.borderDash);
		// The lowest line ends at 14 − 0.49 = 13.51 V: the axis starts at 13 V, not at 0 and not above it.
		expect(data.yMin).toBe(13);
	});
});

describe('run charts', () => {
	it('orders scores by time and marks the runs where a new revision came in', () => {
		const runs = [
			run({ ranAt: '2026-06-03T10:00:00Z', scoreDb: 141, revisionId: 'r2' }),
			run({ ranAt: '2026-06-01T10:00:00Z', scoreDb: 140, revisionId: 'r1' }),
			run({ ranAt: '2026-06-02T10:00:00Z', scoreDb: 140.5, revisionId: 'r1' }),
			run({ ranAt: '2026-06-04T10:00:00Z', scoreDb: null }),
		];
		const data = toScoresOverTime(runs);
		expect(data.datasets[0]!.data.map((p) => p.y)).toEqual([140, 140.5, 141]);
		expect(data.datasets[1]!.data.map((p) => p.y)).toEqual([141]);
	});

	it('draws the reference line as 20·log10 of the voltage ratio through the reference run', () => {
		// Decibels of a power ratio with P ∝ V² (IEC 60027-3 level of a power quantity): +6.02 dB per doubling of V.
		const ref = run({ scoreDb: 140, minV: 12 });
		const data = toScoreVsVoltage([ref, run({ scoreDb: 141, minV: 13 })], ref);
		const line = data.datasets.find((d) => (d.data as unknown[]).length > 2)!;
		for (const p of line.data as Array<{ x: number; y: number }>)
			expect(p.y).toBeCloseTo(140 + 20 * Math.log10(p.x / 12), 9);
	});
});
