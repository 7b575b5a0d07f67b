import '@/components/ui/chart-setup';
import { format } from 'date-fns';
import { Scatter } from 'react-chartjs-2';
import { TRACE_SLOTS } from '@/components/runs/trace-comparison-data';

const DASHES = [[], [6, 4], [2, 3], [10, 3, 2, 3]];

/** Every vehicle's scores over the season on one chart: a line and a mark of its own each. */
export function SeasonScoresChart({
	scores,
}: {
	scores: Array<{ vehicleName: string; ranAt: string; scoreDb: number }>;
}) {
	const names = [...new Set(scores.map((s) => s.vehicleName))].sort();
	const datasets = names.map((name, i) => {
		const slot = TRACE_SLOTS[i % TRACE_SLOTS.length]!;
		return {
			label: name,
			data: scores
				.filter((s) => s.vehicleName === name)
				.map((s) => ({ x: Date.parse(s.ranAt), y: s.scoreDb })),
			borderColor: slot.colour,
			backgroundColor: slot.colour,
			pointStyle: slot.point,
			pointRadius: 6,
			borderDash: DASHES[i % DASHES.length],
			showLine: true,
		};
	});
	return (
		<div className="h-72" data-testid="season-scores" data-series={names.length}>
			<Scatter
				data={{ datasets } as never}
				options={{
					responsive: true,
					maintainAspectRatio: false,
					animation: false,
					scales: {
						x: {
							type: 'linear',
							title: { display: true, text: 'Date' },
							ticks: { callback: (v) => format(new Date(Number(v)), 'd MMM') },
						},
						y: { title: { display: true, text: 'Score (dB)' } },
					},
					plugins: {
						legend: { position: 'bottom', labels: { usePointStyle: true } },
						tooltip: {
							callbacks: {
								label: (c) =>
									`${c.dataset.label}: ${(c.parsed.y ?? 0).toFixed(1)} dB, ${format(new Date(c.parsed.x ?? 0), 'd MMM yyyy')}`,
							},
						},
					},
				}}
				role="img"
				aria-label={`Scores of ${names.join(', ')} over the season`}
			/>
		</div>
	);
}
