import type { BudgetRow, BurpRun, SessionRun, SpeedPoint } from '@/engine/browser';

/** Token colours (the @theme palette), for Chart.js which cannot read CSS variables. */
export const CHART_COLOURS = {
	copper: '#a85a23',
	teal: '#0f7076',
	amber: '#a87400',
	brick: '#b3261e',
	ink: '#1d262e',
	soft: '#55616b',
};

/**
 * The fixed-voltage budget as chart data: alternator supply as a filled area, sustained and burp
 * demand as lines, one point per supply voltage.
 */
export function toBudgetChartData(rows: BudgetRow[]) {
	return {
		labels: rows.map((r) => `${r.voltageV.toFixed(1)} V`),
		datasets: [
			{
				label: 'Alternator supply (A)',
				data: rows.map((r) => r.alternatorSupplyA),
				borderColor: CHART_COLOURS.teal,
				backgroundColor: 'rgba(19,124,130,0.18)',
				fill: 'origin',
				pointRadius: 0,
				tension: 0,
			},
			{
				label: 'Sustained demand (A)',
				data: rows.map((r) => r.sustainedDemandA),
				borderColor: CHART_COLOURS.copper,
				backgroundColor: CHART_COLOURS.copper,
				fill: false,
				pointRadius: 3,
			},
			{
				label: 'Burp demand (A)',
				data: rows.map((r) => r.burpDemandA),
				borderColor: CHART_COLOURS.ink,
				backgroundColor: CHART_COLOURS.ink,
				// Dashed with square marks, so it is told from the sustained line without its colour.
				borderDash: [6, 3],
				pointStyle: 'rect' as const,
				fill: false,
				pointRadius: 3,
			},
		],
	};
}

/**
 * The time-stepped burp as chart data: the lowest amplifier voltage and each bank's terminal
 * voltage over time (thinned to at most ~200 points), and a dashed rule at the drop target below
 * the starting voltage.
 */
export function toBurpChartData(
	run: BurpRun,
	bankLabels: Record<string, string>,
	ruleV: number | null,
) {
	const step = Math.max(1, Math.ceil(run.timeS.length / 200));
	const pick = <T>(xs: T[]) => xs.filter((_, i) => i % step === 0 || i === xs.length - 1);
	const labels = pick(run.timeS).map((t) => t.toFixed(1));
	const banks = Object.entries(run.bankV).map(([id, volts], i) => {
		const look = BANK_LINES[i % BANK_LINES.length]!;
		return {
			label: `${bankLabels[id] ?? id} (V)`,
			data: pick(volts),
			borderColor: look.colour,
			backgroundColor: look.colour,
			borderDash: look.dash,
			pointRadius: 0,
			borderWidth: 1.5,
		};
	});
	const datasets = [
		{
			label: 'Lowest amplifier (V)',
			data: pick(run.minAmplifierV),
			borderColor: CHART_COLOURS.copper,
			backgroundColor: CHART_COLOURS.copper,
			pointRadius: 0,
			borderWidth: 2.5,
		},
		...banks,
	];
	if (ruleV !== null) {
		datasets.push({
			label: `Drop target (${ruleV.toFixed(2)} V)`,
			data: labels.map(() => ruleV),
			borderColor: CHART_COLOURS.amber,
			backgroundColor: CHART_COLOURS.amber,
			pointRadius: 0,
			borderWidth: 1.5,
			borderDash: [6, 4],
		} as never);
	}
	// Volts sit far from zero: the axis starts a little below the lowest line, and says so.
	const lowest = Math.min(...datasets.flatMap((d) => d.data as number[]).filter(Number.isFinite));
	const yMin = Number.isFinite(lowest) ? Math.max(0, Math.floor(lowest - 0.5)) : 0;
	return { labels, datasets, yMin };
}

/** Each bank's line: its own colour and dash, so two banks never look alike (nor rely on hue). */
const BANK_LINES = [
	{ colour: CHART_COLOURS.teal, dash: [] as number[] },
	{ colour: CHART_COLOURS.ink, dash: [6, 3] },
	{ colour: CHART_COLOURS.soft, dash: [2, 3] },
	{ colour: CHART_COLOURS.brick, dash: [10, 3, 2, 3] },
];

/**
 * The engine-speed sweep as chart data: what the system settles at and the lowest amplifier under
 * burp (volts, left axis, solid), the alternators' output and what the banks carry under burp
 * (amps, right axis, dashed), one point per engine speed.
 */
export function toSweepChartData(points: SpeedPoint[]) {
	return {
		labels: points.map((p) => String(p.engineRpm)),
		datasets: [
			{
				label: 'Settles at, burp (V)',
				data: points.map((p) => p.settleV),
				borderColor: CHART_COLOURS.teal,
				backgroundColor: CHART_COLOURS.teal,
				yAxisID: 'y',
				pointStyle: 'circle' as const,
				pointRadius: 2,
			},
			{
				label: 'Lowest amplifier, burp (V)',
				data: points.map((p) => p.lowestAmpV),
				borderColor: CHART_COLOURS.copper,
				backgroundColor: CHART_COLOURS.copper,
				yAxisID: 'y',
				pointStyle: 'triangle' as const,
				pointRadius: 3,
			},
			{
				label: 'Alternators, burp (A)',
				data: points.map((p) => p.alternatorA),
				borderColor: CHART_COLOURS.ink,
				backgroundColor: CHART_COLOURS.ink,
				yAxisID: 'y1',
				borderDash: [6, 3],
				pointStyle: 'rect' as const,
				pointRadius: 2,
			},
			{
				label: 'Banks carry, burp (A)',
				data: points.map((p) => p.bankA),
				borderColor: CHART_COLOURS.brick,
				backgroundColor: CHART_COLOURS.brick,
				yAxisID: 'y1',
				borderDash: [2, 3],
				pointStyle: 'crossRot' as const,
				pointRadius: 3,
			},
		],
	};
}

/**
 * A session of burps as chart data: the bus and the lowest amplifier voltage (solid, left axis)
 * and each bank's state of charge (dashed, right axis) against time from the session's start.
 */
export function toSessionChartData(run: SessionRun, bankLabels: Record<string, string>) {
	const dashes = [
		[6, 3],
		[2, 3],
		[8, 2, 2, 2],
	];
	return {
		datasets: [
			{
				label: 'Bus (V)',
				data: run.trace.timeS.map((t, i) => ({ x: t, y: run.trace.busV[i]! })),
				borderColor: CHART_COLOURS.teal,
				backgroundColor: CHART_COLOURS.teal,
				yAxisID: 'y',
				pointRadius: 0,
			},
			{
				label: 'Lowest amplifier (V)',
				data: run.trace.timeS.map((t, i) => ({ x: t, y: run.trace.lowestAmplifierV[i] ?? null })),
				borderColor: CHART_COLOURS.copper,
				backgroundColor: CHART_COLOURS.copper,
				yAxisID: 'y',
				pointRadius: 0,
			},
			...Object.entries(run.trace.soc).map(([id, soc], k) => ({
				label: `${bankLabels[id] ?? id}, charge (%)`,
				data: run.trace.timeS.map((t, i) => ({ x: t, y: soc[i]! * 100 })),
				borderColor: k % 2 ? CHART_COLOURS.soft : CHART_COLOURS.ink,
				backgroundColor: k % 2 ? CHART_COLOURS.soft : CHART_COLOURS.ink,
				borderDash: dashes[k % dashes.length],
				yAxisID: 'y1',
				pointRadius: 0,
			})),
		],
	};
}
