import { useQueries, useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Scatter } from 'react-chartjs-2';
import {
	type RunDto,
	runDetailQueryOptions,
	teamRunsQueryOptions,
	useRevisionDiff,
} from '@/lib/client/queries/runs';
import { fmt } from '@/lib/format';
import { MEASUREMENT_FIELDS, RUN_MEASUREMENTS } from '@/lib/schemas/run-measurements';
import { burpStartS } from '@/lib/trace-align';
import { voltsAndAmpsOptions, xyOptions } from '@/components/ui/chart-setup';
import { Button } from '@/components/ui/Field';
import {
	type ComparedTrace,
	dbAgainstVolts,
	MAX_COMPARED,
	toDbAgainstVoltsChartData,
	toTraceChartData,
	TRACE_SLOTS,
} from './trace-comparison-data';
import { useLocalFormat } from '@/lib/client/local-time';
import { runVoltage } from '@/lib/run-figures';
import { ScrollRegion } from '@/components/ui/ScrollRegion';

const traceOptions = voltsAndAmpsOptions(
	'Time since the burp began (s)',
	'Voltage (V), solid lines',
	'Current (A), dashed lines',
	{ pointLegend: true, ampsFromZero: true },
);

const dbOptions = xyOptions(
	'Expected from the volts: 20·log10(V_min / V_min of A) (dB)',
	'Measured score change (dB)',
	{ pointLegend: true },
);

const runLabel = (r: RunDto, fmtTime: ReturnType<typeof useLocalFormat>) =>
	`${r.vehicleName} · ${fmtTime(r.ranAt, 'd MMM yyyy HH:mm')}${r.scoreDb !== null ? ` · ${fmt(r.scoreDb, 1)} dB` : ''}`;

/**
 * Up to four runs (of this vehicle or others of the team) compared trace by trace: their logger
 * traces on one chart aligned at the start of each burp (found from the current rise, adjustable),
 * their measurements side by side, what changed between their revisions, and whether the volts
 * each gained turned into score.
 */
export function RunTraceComparison({
	teamId,
	vehicleRuns,
	ids,
	onIdsChange,
}: {
	teamId: string;
	vehicleRuns: RunDto[];
	/** The runs compared, A first (at most MAX_COMPARED). */
	ids: string[];
	onIdsChange: (ids: string[]) => void;
}) {
	const setIds = (f: (xs: string[]) => string[]) => onIdsChange(f(ids).slice(0, MAX_COMPARED));
	const [shift, setShift] = useState<Record<string, number>>({});
	const fmtTime = useLocalFormat();
	const teamRuns = useQuery(teamRunsQueryOptions(teamId));
	const choices = teamRuns.data ?? vehicleRuns;
	const byId = new Map(choices.map((r) => [r.id, r]));
	for (const r of vehicleRuns) if (!byId.has(r.id)) byId.set(r.id, r);
	const chosen = ids.map((id) => byId.get(id)).filter((r): r is RunDto => Boolean(r));

	const details = useQueries({
		queries: chosen.map((r) => ({ ...runDetailQueryOptions(teamId, r.id), enabled: r.hasLogger })),
	});
	const traces: ComparedTrace[] = [];
	const detected: Record<string, number | null> = {};
	chosen.forEach((r, i) => {
		const samples = details[i]?.data?.samples ?? [];
		detected[r.id] = burpStartS(samples);
		if (samples.length)
			traces.push({
				run: r,
				samples,
				startS: (detected[r.id] ?? 0) + (shift[r.id] ?? 0),
				slot: i,
			});
	});
	const loading = details.some((d, i) => chosen[i]?.hasLogger && d.isPending);
	const traceData = toTraceChartData(traces);
	const dbPoints = dbAgainstVolts(chosen);

	const grouped = new Map<string, RunDto[]>();
	for (const r of [...choices].reverse()) {
		if (ids.includes(r.id)) continue;
		grouped.set(r.vehicleName, [...(grouped.get(r.vehicleName) ?? []), r]);
	}

	return (
		<section aria-labelledby="traces-heading" className="flex flex-col gap-4">
			<div>
				<h2 id="traces-heading" className="text-xl font-bold">
					Compare runs trace by trace
				</h2>
				<p className="text-sm text-ink-soft">
					Choose up to {MAX_COMPARED} runs, of this vehicle or another of the team. Traces are lined
					up where each burp’s current rises halfway to its peak; nudge a run’s start if the logger
					caught a false start.
				</p>
			</div>
			<div className="flex flex-wrap items-end gap-3">
				<label className="flex w-full min-w-0 flex-col gap-1 text-sm font-semibold sm:w-auto sm:max-w-xl">
					Add a run
					<select
						value=""
						disabled={ids.length >= MAX_COMPARED}
						onChange={(e) => e.target.value && setIds((xs) => [...xs, e.target.value])}
						className="w-full max-w-full min-w-0 rounded-md border border-hairline bg-card px-3 py-2 font-normal"
					>
						<option value="">
							{ids.length >= MAX_COMPARED
								? `${MAX_COMPARED} runs chosen: remove one to add another`
								: 'Choose a run…'}
						</option>
						{[...grouped].map(([vehicle, rs]) => (
							<optgroup key={vehicle} label={vehicle}>
								{rs.map((r) => (
									<option key={r.id} value={r.id}>
										{runLabel(r, fmtTime)}
										{r.hasLogger ? '' : ' (no logger file)'}
									</option>
								))}
							</optgroup>
						))}
					</select>
				</label>
			</div>
			{chosen.length === 0 ? (
				<p className="rounded-md border border-dashed border-hairline p-4 text-sm text-ink-soft">
					No run chosen yet. Runs with a logger file draw their volts and amps here.
				</p>
			) : (
				<>
					<ul className="flex flex-col gap-2" aria-label="Runs compared">
						{chosen.map((r, i) => {
							const slot = TRACE_SLOTS[i]!;
							const start = detected[r.id];
							return (
								<li
									key={r.id}
									className="flex flex-wrap items-center gap-3 rounded-md border border-hairline bg-card px-3 py-2 text-sm"
									data-compared={slot.letter}
								>
									<span
										className="inline-flex h-6 w-6 shrink-0 items-center justify-center rounded-full font-bold text-white"
										style={{ backgroundColor: slot.colour }}
										aria-hidden="true"
									>
										{slot.letter}
									</span>
									<span className="min-w-0 flex-1 basis-48 break-words">
										<span className="sr-only">Run {slot.letter}: </span>
										{runLabel(r, fmtTime)}
										{r.revisionNumber ? ` · r${r.revisionNumber}` : ''}
									</span>
									{r.hasLogger ? (
										<label className="flex items-center gap-1">
											Start {start === null || start === undefined ? '' : `${fmt(start, 2)} s`} +
											<input
												type="number"
												step={0.05}
												value={shift[r.id] ?? 0}
												onChange={(e) =>
													setShift((s) => ({ ...s, [r.id]: Number(e.target.value) || 0 }))
												}
												aria-label={`Move run ${slot.letter}’s start (s)`}
												className="num w-20 rounded border border-hairline px-1 py-0.5"
											/>
											s
										</label>
									) : (
										<span className="text-ink-soft">no logger file</span>
									)}
									<Button
										type="button"
										variant="secondary"
										className="px-2 py-1 text-xs"
										onClick={() => setIds((xs) => xs.filter((x) => x !== r.id))}
									>
										Remove {slot.letter}
									</Button>
								</li>
							);
						})}
					</ul>
					<div className="rounded-md border border-hairline bg-card p-3">
						{loading ? (
							<p role="status" className="text-sm text-ink-soft">
								Loading the traces…
							</p>
						) : traces.length ? (
							<div className="h-80" data-testid="trace-chart" data-traces={traces.length}>
								<Scatter
									data={traceData as never}
									options={traceOptions}
									role="img"
									aria-label={`Volts and amps of ${traces.length} runs against the time since each burp began`}
								/>
							</div>
						) : (
							<p className="text-sm text-ink-soft">None of the chosen runs has a logger file.</p>
						)}
					</div>
					<ScrollRegion label="Measurements of the compared runs">
						<table className="w-full rounded-md border border-hairline bg-card text-sm">
							<caption className="sr-only">The chosen runs’ measurements side by side</caption>
							<thead className="bg-paper text-xs text-ink-soft">
								<tr>
									<th scope="col" className="px-3 py-2 text-left">
										Measure
									</th>
									{chosen.map((r, i) => (
										<th key={r.id} scope="col" className="px-3 py-2 text-left">
											{TRACE_SLOTS[i]!.letter}
										</th>
									))}
								</tr>
							</thead>
							<tbody>
								{(
									[
										['Vehicle', (r) => r.vehicleName],
										['When', (r) => fmtTime(r.ranAt, 'd MMM yyyy HH:mm')],
										['Revision', (r) => (r.revisionNumber ? `r${r.revisionNumber}` : '—')],
										...MEASUREMENT_FIELDS.map(
											(f) =>
												[
													RUN_MEASUREMENTS[f].label,
													(r: RunDto) => {
														// Voltages from the logger where there is one, the typed figure beside.
														const v =
															f === 'restingV' || f === 'minV'
																? runVoltage(r, f)
																: { value: r[f], fromLogger: false, typed: null };
														if (v.value === null) return '—';
														const { decimals, unit } = RUN_MEASUREMENTS[f];
														const shown = `${fmt(v.value, decimals)} ${unit}`;
														if (!v.fromLogger) return shown;
														return v.typed === null
															? `${shown} (logger)`
															: `${shown} (logger; typed ${fmt(v.typed, decimals)})`;
													},
												] as const,
										),
									] as Array<readonly [string, (r: RunDto) => string]>
								).map(([label, f]) => (
									<tr key={label} className="border-t border-hairline">
										<th scope="row" className="px-3 py-1.5 text-left font-normal text-ink-soft">
											{label}
										</th>
										{chosen.map((r) => (
											<td key={r.id} className="num px-3 py-1.5">
												{f(r)}
											</td>
										))}
									</tr>
								))}
							</tbody>
						</table>
					</ScrollRegion>
					{chosen.length > 1 && (
						<div>
							<h3 className="font-semibold">What changed between their revisions</h3>
							<ul className="mt-1 flex flex-col gap-1 text-sm">
								{chosen.slice(1).map((r, i) => (
									<RevisionChange
										key={r.id}
										teamId={teamId}
										a={chosen[0]!}
										b={r}
										letter={TRACE_SLOTS[i + 1]!.letter}
									/>
								))}
							</ul>
						</div>
					)}
					{dbPoints.length > 0 && (
						<div className="grid gap-4 lg:grid-cols-2">
							<div className="rounded-md border border-hairline bg-card p-3">
								<div className="h-64">
									<Scatter
										data={toDbAgainstVoltsChartData(dbPoints) as never}
										options={dbOptions}
										role="img"
										aria-label="Measured score change against what the voltage change predicts"
									/>
								</div>
							</div>
							<table className="h-fit rounded-md border border-hairline bg-card text-sm">
								<caption className="px-3 pt-2 text-left font-semibold">
									Did the volts turn into score?
								</caption>
								<thead className="text-xs text-ink-soft">
									<tr>
										<th scope="col" className="px-3 py-1.5 text-left">
											Run
										</th>
										<th scope="col" className="px-3 py-1.5 text-right">
											From the volts
										</th>
										<th scope="col" className="px-3 py-1.5 text-right">
											Measured
										</th>
										<th scope="col" className="px-3 py-1.5 text-right">
											Beyond the volts
										</th>
									</tr>
								</thead>
								<tbody>
									{dbPoints.map((p) => (
										<tr key={p.letter} className="border-t border-hairline">
											<th scope="row" className="px-3 py-1.5 text-left font-normal">
												{p.letter} against A
											</th>
											<td className="num px-3 py-1.5 text-right">{signed(p.expectedDb)} dB</td>
											<td className="num px-3 py-1.5 text-right">{signed(p.measuredDb)} dB</td>
											<td className="num px-3 py-1.5 text-right">
												{signed(p.measuredDb - p.expectedDb)} dB
											</td>
										</tr>
									))}
								</tbody>
							</table>
						</div>
					)}
				</>
			)}
		</section>
	);
}

const signed = (x: number) => `${x >= 0 ? '+' : '−'}${fmt(Math.abs(x), 2)}`;

function RevisionChange({
	teamId,
	a,
	b,
	letter,
}: {
	teamId: string;
	a: RunDto;
	b: RunDto;
	letter: string;
}) {
	const same = a.vehicleId === b.vehicleId;
	const diff = useRevisionDiff(
		teamId,
		a.vehicleId,
		same ? a.revisionId : null,
		same ? b.revisionId : null,
	);
	let text: string;
	if (!same) text = `${b.vehicleName} is another vehicle: its build is compared as a whole.`;
	else if (!a.revisionId || !b.revisionId) text = 'One of the two runs has no revision.';
	else if (a.revisionId === b.revisionId) text = `Same revision as A (r${a.revisionNumber}).`;
	else if (diff.data)
		text = `r${a.revisionNumber} → r${b.revisionNumber}: ${
			diff.data.changes.map((c) => `${c.label} (${c.kind})`).join(', ') ||
			'no change to the network'
		}.`;
	else if (diff.isError) text = 'Could not load what changed.';
	else text = 'Comparing their revisions…';
	return (
		<li>
			<span className="font-semibold">{letter}:</span> {text}
		</li>
	);
}
