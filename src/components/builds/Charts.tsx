import { CategoryScale, Chart as ChartJS, Filler } from 'chart.js';
import '@/components/ui/chart-setup';
import { useMemo } from 'react';
import { Line } from 'react-chartjs-2';
import type { BudgetRow, BurpRun, SessionRun, SpeedPoint } from '@/engine/browser';
import {
	toBudgetChartData,
	toBurpChartData,
	toSessionChartData,
	toSweepChartData,
} from './chart-data';

ChartJS.register(CategoryScale, Filler);

/** One chart's frame: its height, and the canvas named for a screen reader. */
function LineFrame({ data, options, label }: { data: unknown; options: object; label: string }) {
	return (
		<div className="h-64">
			<Line data={data as never} options={options} aria-label={label} role="img" />
		</div>
	);
}

const budgetOptions = {
	responsive: true,
	maintainAspectRatio: false,
	animation: false as const,
	interaction: { mode: 'index' as const, intersect: false },
	scales: {
		y: { beginAtZero: true, title: { display: true, text: 'Current (A)' } },
		x: { title: { display: true, text: 'Supply voltage' } },
	},
	plugins: { legend: { position: 'bottom' as const, labels: { usePointStyle: true } } },
};

const burpOptions = {
	responsive: true,
	maintainAspectRatio: false,
	animation: false as const,
	interaction: { mode: 'index' as const, intersect: false },
	scales: {
		y: { title: { display: true, text: 'Voltage (V)' } },
		x: { title: { display: true, text: 'Time into the burp (s)' }, ticks: { maxTicksLimit: 11 } },
	},
	plugins: { legend: { position: 'bottom' as const, labels: { usePointStyle: true } } },
};

export function BudgetChart({ rows }: { rows: BudgetRow[] }) {
	const data = useMemo(() => toBudgetChartData(rows), [rows]);
	return (
		<LineFrame
			data={data}
			options={budgetOptions}
			label="Current demand against alternator supply at each supply voltage"
		/>
	);
}

export function BurpChart({
	run,
	bankLabels,
	ruleV,
}: {
	run: BurpRun;
	bankLabels: Record<string, string>;
	ruleV: number | null;
}) {
	const data = useMemo(() => toBurpChartData(run, bankLabels, ruleV), [run, bankLabels, ruleV]);
	const options = useMemo(
		() => ({
			...burpOptions,
			scales: {
				...burpOptions.scales,
				y: {
					min: data.yMin,
					title: {
						display: true,
						text: data.yMin > 0 ? `Voltage (V), axis from ${data.yMin} V` : 'Voltage (V)',
					},
				},
			},
		}),
		[data.yMin],
	);
	return <LineFrame data={data} options={options} label="Voltages over the time of a burp" />;
}

const sweepOptions = {
	responsive: true,
	maintainAspectRatio: false,
	animation: false as const,
	interaction: { mode: 'index' as const, intersect: false },
	scales: {
		x: { title: { display: true, text: 'Engine speed (rpm)' }, ticks: { maxTicksLimit: 10 } },
		y: {
			type: 'linear' as const,
			position: 'left' as const,
			title: { display: true, text: 'Voltage (V), solid' },
		},
		y1: {
			type: 'linear' as const,
			position: 'right' as const,
			beginAtZero: true,
			title: { display: true, text: 'Current (A), dashed' },
			grid: { drawOnChartArea: false },
		},
	},
	plugins: { legend: { position: 'bottom' as const, labels: { usePointStyle: true } } },
};

export function SweepChart({ points }: { points: SpeedPoint[] }) {
	const data = useMemo(() => toSweepChartData(points), [points]);
	return (
		<LineFrame
			data={data}
			options={sweepOptions}
			label="Settle voltage, lowest amplifier, alternator output and bank current from idle to high engine speed"
		/>
	);
}

const sessionOptions = {
	responsive: true,
	maintainAspectRatio: false,
	animation: false as const,
	parsing: false as const,
	interaction: { mode: 'nearest' as const, axis: 'x' as const, intersect: false },
	scales: {
		x: {
			type: 'linear' as const,
			title: { display: true, text: 'Time from the first burp (s)' },
			ticks: { maxTicksLimit: 10 },
		},
		y: {
			type: 'linear' as const,
			position: 'left' as const,
			title: { display: true, text: 'Voltage (V), solid' },
		},
		y1: {
			type: 'linear' as const,
			position: 'right' as const,
			title: { display: true, text: 'State of charge (%), dashed' },
			grid: { drawOnChartArea: false },
		},
	},
	plugins: { legend: { position: 'bottom' as const, labels: { usePointStyle: true } } },
};

export function SessionChart({
	run,
	bankLabels,
}: {
	run: SessionRun;
	bankLabels: Record<string, string>;
}) {
	const data = useMemo(() => toSessionChartData(run, bankLabels), [run, bankLabels]);
	return (
		<LineFrame
			data={data}
			options={sessionOptions}
			label="Bus voltage, lowest amplifier voltage and each bank's state of charge through the session"
		/>
	);
}
