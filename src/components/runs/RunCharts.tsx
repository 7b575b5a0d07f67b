import { voltsAndAmpsOptions, xyOptions } from '@/components/ui/chart-setup';
import { useMemo } from 'react';
import { Scatter } from 'react-chartjs-2';
import type { Sample } from '@/engine/browser';
import type { RunDto } from '@/lib/schemas/runs';
import { toSamplesChartData, toScoresOverTime, toScoreVsVoltage } from './run-chart-data';

const samplesOptions = voltsAndAmpsOptions('Time (s)', 'Voltage (V)', 'Current (A)');

const overTimeOptions = xyOptions('Date', 'Score (dB)', {
	xTicks: (v) => new Date(Number(v)).toISOString().slice(0, 10),
});

const vsVoltageOptions = xyOptions('Minimum voltage during the run (V)', 'Score (dB)');

export function SamplesChart({ samples }: { samples: Sample[] }) {
	const data = useMemo(() => toSamplesChartData(samples), [samples]);
	return (
		<div className="h-64">
			<Scatter
				data={data as never}
				options={samplesOptions}
				aria-label="Voltage and current over the run"
				role="img"
			/>
		</div>
	);
}

export function ScoresOverTimeChart({ runs }: { runs: RunDto[] }) {
	const data = useMemo(() => toScoresOverTime(runs), [runs]);
	return (
		<div className="h-64">
			<Scatter
				data={data as never}
				options={overTimeOptions as never}
				aria-label="Scores over time, with changes of revision marked"
				role="img"
			/>
		</div>
	);
}

export function ScoreVsVoltageChart({
	runs,
	reference,
}: {
	runs: RunDto[];
	reference: RunDto | null;
}) {
	const data = useMemo(() => toScoreVsVoltage(runs, reference), [runs, reference]);
	return (
		<div
			className="h-64"
			data-testid="score-vs-voltage"
			data-points={(data.datasets[0]!.data as unknown[]).length}
		>
			<Scatter
				data={data as never}
				options={vsVoltageOptions}
				aria-label="Score against measured supply voltage with the expected line"
				role="img"
			/>
		</div>
	);
}
