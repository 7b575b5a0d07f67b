import { voltageRatioDb, type Sample } from '@/engine/browser';
import { CHART_COLOURS } from '@/components/builds/chart-data';
import { alignTrace } from '@/lib/trace-align';
import type { RunDto } from '@/lib/schemas/runs';
import { runVoltage } from '@/lib/run-figures';

/** The letters runs are called by in the comparison, and what tells their lines apart. */
export const TRACE_SLOTS = [
	{ letter: 'A', colour: CHART_COLOURS.copper, point: 'circle' as const },
	{ letter: 'B', colour: CHART_COLOURS.teal, point: 'triangle' as const },
	{ letter: 'C', colour: CHART_COLOURS.ink, point: 'rect' as const },
	{ letter: 'D', colour: CHART_COLOURS.amber, point: 'crossRot' as const },
];
export const MAX_COMPARED = TRACE_SLOTS.length;

export interface ComparedTrace {
	run: RunDto;
	samples: Sample[];
	/** The instant (s, in the file's own time) taken as the start of the burp. */
	startS: number;
	/** The run's place in the comparison (0 is A), which gives its letter, colour and mark. */
	slot: number;
}

/**
 * Volts (solid, left axis) and amps (dashed, right axis) of each run against the time since its
 * burp started. Each run has its own colour and its own point mark, and its letter in the legend,
 * so the lines are told apart without relying on hue.
 */
export function toTraceChartData(traces: ComparedTrace[]) {
	const datasets: Array<Record<string, unknown>> = [];
	traces.forEach((t) => {
		const slot = TRACE_SLOTS[t.slot]!;
		const pts = alignTrace(t.samples, t.startS, 300);
		const common = {
			borderColor: slot.colour,
			backgroundColor: slot.colour,
			pointStyle: slot.point,
			pointRadius: (ctx: { dataIndex: number }) => (ctx.dataIndex % 25 === 0 ? 4 : 0),
			showLine: true,
			borderWidth: 2,
		};
		datasets.push(
			{
				...common,
				label: `${slot.letter} volts`,
				data: pts.map((s) => ({ x: s.tS, y: s.volts })),
				yAxisID: 'y',
			},
			{
				...common,
				label: `${slot.letter} amps`,
				data: pts.map((s) => ({ x: s.tS, y: s.amps })),
				yAxisID: 'y1',
				borderDash: [6, 4],
				borderWidth: 1.5,
			},
		);
	});
	return { datasets };
}

/** Score change against the first run, beside what 20·log10 of the voltage ratio predicts. */
export interface DbAgainstVolts {
	letter: string;
	/** 20·log10(V_min / V_min of A): what the volts alone would give an unregulated amplifier. */
	expectedDb: number;
	measuredDb: number;
}

export function dbAgainstVolts(runs: RunDto[]): DbAgainstVolts[] {
	const a = runs[0];
	// The logger's minimum where a run has a file (the typed one only where it has none).
	const minOf = (r: RunDto) => runVoltage(r, 'minV').value;
	const aMin = a ? minOf(a) : null;
	if (!a || a.scoreDb === null || aMin === null) return [];
	const out: DbAgainstVolts[] = [];
	runs.forEach((r, i) => {
		const rMin = minOf(r);
		if (i === 0 || r.scoreDb === null || rMin === null) return;
		out.push({
			letter: TRACE_SLOTS[i]!.letter,
			expectedDb: voltageRatioDb(rMin, aMin),
			measuredDb: r.scoreDb - a.scoreDb!,
		});
	});
	return out;
}

export function toDbAgainstVoltsChartData(points: DbAgainstVolts[]) {
	const span = Math.max(
		0.5,
		...points.flatMap((p) => [Math.abs(p.expectedDb), Math.abs(p.measuredDb)]),
	);
	return {
		datasets: [
			...points.map((p) => {
				const slot = TRACE_SLOTS.find((s) => s.letter === p.letter)!;
				return {
					label: `${p.letter} against A`,
					data: [{ x: p.expectedDb, y: p.measuredDb }],
					borderColor: slot.colour,
					backgroundColor: slot.colour,
					pointStyle: slot.point,
					pointRadius: 7,
					showLine: false,
				};
			}),
			{
				label: 'Volts alone (measured = 20·log10 V/V_A)',
				data: [
					{ x: -span * 1.2, y: -span * 1.2 },
					{ x: span * 1.2, y: span * 1.2 },
				],
				borderColor: CHART_COLOURS.soft,
				backgroundColor: CHART_COLOURS.soft,
				borderDash: [4, 4],
				pointRadius: 0,
				showLine: true,
			},
		],
	};
}
