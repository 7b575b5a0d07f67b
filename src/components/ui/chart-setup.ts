import { Chart, Legend, LinearScale, LineElement, PointElement, Tooltip } from 'chart.js';

/**
 * What every Sagwise chart needs from Chart.js, registered once, and our own type for its text.
 * A chart that needs more (categories, fills, bars) registers those beside itself, so pages load
 * only the parts they draw.
 */
Chart.register(LinearScale, PointElement, LineElement, Tooltip, Legend);
Chart.defaults.font.family = "'Public Sans Variable', system-ui, sans-serif";

export { Chart };

/** Volts on the left axis and amps on the right, against a linear x axis: one definition. */
export function voltsAndAmpsOptions(
	xTitle: string,
	yTitle: string,
	y1Title: string,
	opts: { pointLegend?: boolean; ampsFromZero?: boolean } = {},
) {
	return {
		responsive: true,
		maintainAspectRatio: false,
		animation: false as const,
		scales: {
			x: { type: 'linear' as const, title: { display: true, text: xTitle } },
			y: {
				type: 'linear' as const,
				position: 'left' as const,
				title: { display: true, text: yTitle },
			},
			y1: {
				type: 'linear' as const,
				position: 'right' as const,
				...(opts.ampsFromZero ? { min: 0 } : {}),
				title: { display: true, text: y1Title },
				grid: { drawOnChartArea: false },
			},
		},
		plugins: {
			legend: {
				position: 'bottom' as const,
				...(opts.pointLegend ? { labels: { usePointStyle: true } } : {}),
			},
		},
	};
}

/** One linear axis against another (a scatter or a line through points), legend below. */
export function xyOptions(
	xTitle: string,
	yTitle: string,
	opts: { pointLegend?: boolean; xTicks?: (v: number | string) => string } = {},
) {
	return {
		responsive: true,
		maintainAspectRatio: false,
		animation: false as const,
		scales: {
			x: {
				type: 'linear' as const,
				title: { display: true, text: xTitle },
				...(opts.xTicks ? { ticks: { callback: opts.xTicks } } : {}),
			},
			y: { type: 'linear' as const, title: { display: true, text: yTitle } },
		},
		plugins: {
			legend: {
				position: 'bottom' as const,
				...(opts.pointLegend ? { labels: { usePointStyle: true } } : {}),
			},
		},
	};
}
