import { voltageRatioDb, type Sample } from '@/engine/browser';
import type { RunDto } from '@/lib/schemas/runs';
import { runVoltage } from '@/lib/run-figures';
import { CHART_COLOURS } from '@/components/builds/chart-data';

/** Volts and amps over time, thinned to at most ~400 points. */
export function toSamplesChartData(samples: Sample[]) {
	const step = Math.max(1, Math.ceil(samples.length / 400));
	const pts = samples.filter((_, i) => i % step === 0 || i === samples.length - 1);
	return {
		datasets: [
			{
				label: 'Voltage (V)',
				data: pts.map((s) => ({ x: s.tS, y: s.volts })),
				borderColor: CHART_COLOURS.teal,
				backgroundColor: CHART_COLOURS.teal,
				yAxisID: 'y',
				pointRadius: 0,
				showLine: true,
				borderWidth: 2,
			},
			{
				label: 'Current (A)',
				data: pts.map((s) => ({ x: s.tS, y: s.amps })),
				borderColor: CHART_COLOURS.copper,
				backgroundColor: CHART_COLOURS.copper,
				yAxisID: 'y1',
				pointRadius: 0,
				showLine: true,
				borderWidth: 2,
			},
		],
	};
}

/** Scores over time; points where the revision changed from the previous run are marked. */
export function toScoresOverTime(runs: RunDto[]) {
	const scored = runs
		.filter((r) => r.scoreDb !== null)
		.sort((a, b) => a.ranAt.localeCompare(b.ranAt));
	const changed = scored.filter((r, i) => i > 0 && r.revisionId !== scored[i - 1]!.revisionId);
	return {
		datasets: [
			{
				label: 'Score (dB)',
				data: scored.map((r) => ({ x: Date.parse(r.ranAt), y: r.scoreDb! })),
				borderColor: CHART_COLOURS.copper,
				backgroundColor: CHART_COLOURS.copper,
				showLine: true,
				pointRadius: 4,
			},
			{
				label: 'New revision in force',
				data: changed.map((r) => ({ x: Date.parse(r.ranAt), y: r.scoreDb! })),
				borderColor: CHART_COLOURS.teal,
				backgroundColor: 'rgba(0,0,0,0)',
				pointStyle: 'rectRot' as const,
				pointRadius: 9,
				borderWidth: 2,
				showLine: false,
			},
		],
	};
}

/**
 * Score against the voltage measured during the run, with the line the model expects from a
 * reference run: score_ref + 20·log10(V / V_ref) (an unregulated amplifier, P ∝ V²).
 */
export function toScoreVsVoltage(runs: RunDto[], reference: RunDto | null) {
	const minOf = (r: RunDto) => runVoltage(r, 'minV').value;
	const pts = runs.flatMap((r) => {
		const v = minOf(r);
		return r.scoreDb !== null && v !== null ? [{ x: v, y: r.scoreDb }] : [];
	});
	const datasets: Array<Record<string, unknown>> = [
		{
			label: 'Runs (score at the measured minimum voltage)',
			data: pts,
			borderColor: CHART_COLOURS.copper,
			backgroundColor: CHART_COLOURS.copper,
			pointRadius: 5,
			showLine: false,
		},
	];
	const refV = reference ? minOf(reference) : null;
	if (reference && reference.scoreDb !== null && refV !== null) {
		const xs = pts.map((p) => p.x);
		const lo = Math.min(...xs, refV) - 0.3;
		const hi = Math.max(...xs, refV) + 0.3;
		const line = Array.from({ length: 21 }, (_, i) => lo + ((hi - lo) * i) / 20).map((v) => ({
			x: v,
			y: reference.scoreDb! + voltageRatioDb(v, refV),
		}));
		datasets.push({
			label: `Expected from the reference run (+20·log10 V/${refV.toFixed(2)} V)`,
			data: line,
			borderColor: CHART_COLOURS.teal,
			backgroundColor: CHART_COLOURS.teal,
			borderDash: [6, 4],
			pointRadius: 0,
			showLine: true,
		});
	}
	return { datasets };
}
