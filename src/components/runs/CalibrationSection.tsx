import { xyOptions } from '@/components/ui/chart-setup';
import { useMemo, useState } from 'react';
import { Scatter } from 'react-chartjs-2';
import { CHART_COLOURS } from '@/components/builds/chart-data';
import { Button, FormMessage } from '@/components/ui/Field';
import type {
	BuildDocument,
	CalibrationParameter,
	CalibrationResult,
	Sample,
} from '@/engine/browser';
import { ApiError } from '@/lib/client/api-client';
import { calibrateInWorker } from '@/lib/client/engine-worker';
import { useCreatePlan } from '@/lib/client/queries/plans';
import { defaultCalibrationFit, engineSpeedGuess } from '@/lib/engine-speed-guess';
import { fmt } from '@/lib/format';
import { ScrollRegion } from '@/components/ui/ScrollRegion';

interface Props {
	teamId: string;
	vehicleId: string;
	revision: { id: string; number: number; document: BuildDocument };
	samples: Sample[];
	/** A member may start a plan from the fitted values. */
	canPlan: boolean;
	/** "3 May 2026 14:05": names the plan. */
	runLabel: string;
}

const CHOICES: { key: CalibrationParameter; label: string; hint: string }[] = [
	{
		key: 'bankResistance',
		label: 'Bank internal resistance',
		hint: 'one factor for every bank: age, cold, a weak cell',
	},
	{
		key: 'bankCharge',
		label: 'Banks’ state of charge',
		hint: 'where the log rests before the burp: banks are rarely full at the lanes',
	},
	{
		key: 'alternatorOutput',
		label: 'Alternator output at this engine speed',
		hint: 'one factor for every alternator: a slipping belt, a hot stator',
	},
	{
		key: 'connection',
		label: 'Extra resistance in one cable’s joints',
		hint: 'a tired crimp or a loose lug',
	},
];

const chartOptions = xyOptions('Current into the amplifiers (A)', 'Lowest amplifier voltage (V)');

/**
 * Fits the revision's model to this run's log: which bank resistance, alternator output or
 * connection resistance explains what the logger saw. Shows the model's error before and after
 * and offers the fitted values as a new plan; the build itself is never changed.
 */
export function CalibrationSection({
	teamId,
	vehicleId,
	revision,
	samples,
	canPlan,
	runLabel,
}: Props) {
	const engineGuess = useMemo(
		() => engineSpeedGuess(revision.document, samples),
		[revision.document, samples],
	);
	const [fit, setFit] = useState<CalibrationParameter[]>(() =>
		defaultCalibrationFit(engineGuess.rpm),
	);
	const [cableId, setCableId] = useState(revision.document.cables[0]?.id ?? '');
	const [rpmText, setRpmText] = useState(String(engineGuess.rpm));
	const [state, setState] = useState<
		| { kind: 'idle' }
		| { kind: 'running' }
		| { kind: 'done'; result: CalibrationResult }
		| { kind: 'error'; message: string }
	>({ kind: 'idle' });
	const createPlan = useCreatePlan(teamId, vehicleId);
	const rpm = Number(rpmText);
	const rpmOk = rpmText.trim() !== '' && Number.isFinite(rpm) && rpm >= 0 && rpm <= 10000;

	const run = async () => {
		setState({ kind: 'running' });
		createPlan.reset();
		try {
			const result = await calibrateInWorker(revision.document, samples, {
				engineRpm: rpm,
				conductorTempC: 25,
				fit,
				cableId: fit.includes('connection') ? cableId : undefined,
			});
			setState({ kind: 'done', result });
		} catch (e) {
			setState({ kind: 'error', message: e instanceof Error ? e.message : 'The fit failed.' });
		}
	};

	const result = state.kind === 'done' && state.result.ok ? state.result : null;
	const chart = useMemo(
		() =>
			result && {
				datasets: [
					{
						label: 'Logged',
						data: result.trace.map((p) => ({ x: p.amps, y: p.measuredV })),
						backgroundColor: CHART_COLOURS.ink,
						pointRadius: 2,
					},
					{
						label: `Revision r${revision.number} as drawn`,
						data: result.trace.map((p) => ({ x: p.amps, y: p.beforeV })),
						borderColor: CHART_COLOURS.soft,
						borderDash: [5, 4],
						showLine: true,
						pointRadius: 0,
					},
					{
						label: 'With the fitted values',
						data: result.trace.map((p) => ({ x: p.amps, y: p.afterV })),
						borderColor: CHART_COLOURS.copper,
						showLine: true,
						pointRadius: 0,
					},
				],
			},
		[result, revision.number],
	);

	return (
		<section aria-labelledby="calibration-heading" className="mt-4 rounded-md bg-paper p-3 text-sm">
			<h3 id="calibration-heading" className="font-semibold">
				Calibrate the model from this log
			</h3>
			<p className="mt-1 text-ink-soft">
				Finds the values that make revision r{revision.number} reproduce what the logger saw,
				assuming it read the lowest amplifier&apos;s terminals and the current into the amplifiers.
				The build is not changed: the fitted values can start a plan.
			</p>
			<fieldset className="mt-2">
				<legend className="font-semibold">Values to fit</legend>
				{CHOICES.map((c) => (
					<label key={c.key} className="mt-1 flex items-start gap-2">
						<input
							type="checkbox"
							className="mt-1"
							checked={fit.includes(c.key)}
							onChange={(e) =>
								setFit((f) => (e.target.checked ? [...f, c.key] : f.filter((k) => k !== c.key)))
							}
						/>
						<span>
							{c.label} <span className="text-ink-soft">— {c.hint}</span>
						</span>
					</label>
				))}
			</fieldset>
			<div className="mt-2 flex flex-wrap items-end gap-3">
				{fit.includes('connection') && (
					<label className="flex flex-col">
						<span className="font-semibold">Cable</span>
						<select
							className="rounded-md border border-hairline bg-card px-2 py-1"
							value={cableId}
							onChange={(e) => setCableId(e.target.value)}
						>
							{revision.document.cables.map((c) => (
								<option key={c.id} value={c.id}>
									{c.label}
								</option>
							))}
						</select>
					</label>
				)}
				<label className="flex flex-col">
					<span className="font-semibold">Engine speed during the run (rpm)</span>
					<input
						inputMode="numeric"
						className="num w-28 rounded-md border border-hairline bg-card px-2 py-1"
						value={rpmText}
						aria-invalid={!rpmOk}
						aria-describedby={rpmOk ? undefined : 'calibration-rpm-error'}
						onChange={(e) => setRpmText(e.target.value)}
					/>
				</label>
				<Button
					type="button"
					busy={state.kind === 'running'}
					disabled={fit.length === 0 || !rpmOk || state.kind === 'running'}
					onClick={run}
				>
					Fit the model to this log
				</Button>
			</div>
			<p className="mt-1 text-ink-soft" data-engine-guess>
				{engineGuess.why}
			</p>
			{!rpmOk && (
				<p id="calibration-rpm-error" className="mt-1 text-brick">
					Give the engine speed as a number from 0 to 10 000.
				</p>
			)}
			{state.kind === 'running' && (
				<p role="status" className="mt-2 text-ink-soft">
					Fitting… (a few hundred solves of the network)
				</p>
			)}
			{state.kind === 'error' && <FormMessage tone="error">{state.message}</FormMessage>}
			{state.kind === 'done' && !state.result.ok && (
				<FormMessage tone="error">{state.result.reason}</FormMessage>
			)}
			{result && chart && (
				<div className="mt-3" aria-live="polite">
					<p>
						The model missed the log by{' '}
						<strong className="num">{fmt(result.rmsBeforeV, 3)} V</strong> (root mean square) as
						drawn, and by <strong className="num">{fmt(result.rmsAfterV, 3)} V</strong> with the
						fitted values, over {result.points} samples.
					</p>
					<ScrollRegion label="Fitted values" className="mt-2">
						<table className="num w-full text-left">
							<caption className="sr-only">Fitted values</caption>
							<thead>
								<tr className="border-b border-hairline">
									<th scope="col" className="py-1 pr-3">
										Value
									</th>
									<th scope="col" className="py-1 pr-3 text-right">
										In r{revision.number}
									</th>
									<th scope="col" className="py-1 pr-3 text-right">
										Fitted
									</th>
									<th scope="col" className="py-1 text-right">
										± (about 95 %)
									</th>
								</tr>
							</thead>
							<tbody>
								{result.parameters.map((p) => (
									<tr key={p.key} className="border-b border-hairline/60">
										<th scope="row" className="py-1 pr-3 font-normal">
											{p.label}
										</th>
										<td className="py-1 pr-3 text-right">
											{fmt(p.before, p.unit === 'A' ? 0 : 2)} {p.unit}
										</td>
										<td className="py-1 pr-3 text-right font-semibold">
											{p.determined ? `${fmt(p.fitted, p.unit === 'A' ? 0 : 2)} ${p.unit}` : '—'}
										</td>
										<td className="py-1 text-right">
											{p.determined && p.uncertainty !== null
												? `± ${fmt(p.uncertainty, p.unit === 'A' ? 0 : 2)} ${p.unit}`
												: 'this log cannot tell'}
										</td>
									</tr>
								))}
							</tbody>
						</table>
					</ScrollRegion>
					{result.parameters.some((p) => p.reason) && (
						<ul className="mt-2 flex flex-col gap-1 text-ink-soft" data-undetermined>
							{result.parameters
								.filter((p) => p.reason)
								.map((p) => (
									<li key={p.key}>
										<span className="font-semibold text-ink">{p.label}:</span> {p.reason}
									</li>
								))}
						</ul>
					)}
					<div className="mt-3 h-64">
						<Scatter
							data={chart as never}
							options={chartOptions}
							role="img"
							aria-label="Logged voltage against current, with the model as drawn and with the fitted values"
						/>
					</div>
					{canPlan && !result.parameters.some((p) => p.determined) && (
						<p className="mt-3 text-ink-soft">
							Nothing was fitted, so there is no plan to start from these values.
						</p>
					)}
					{canPlan && result.parameters.some((p) => p.determined) && (
						<div className="mt-3 flex flex-wrap items-center gap-3">
							<Button
								type="button"
								busy={createPlan.isPending}
								disabled={createPlan.isPending || createPlan.isSuccess}
								onClick={() =>
									createPlan.mutate({
										name: `Fitted to the run of ${runLabel}`,
										fromRevisionId: revision.id,
										document: result.document,
										notes: result.parameters
											.filter((p) => p.determined)
											.map(
												(p) =>
													`${p.label}: ${fmt(p.fitted, 2)} ${p.unit} (was ${fmt(p.before, 2)} ${p.unit})`,
											)
											.join('\n'),
									})
								}
							>
								Start a plan from these values
							</Button>
							{createPlan.isSuccess && (
								<a
									className="font-semibold text-teal underline"
									href={`/teams/${teamId}/vehicles/${vehicleId}/plans/${createPlan.data.id}`}
								>
									Open the plan “{createPlan.data.name}”
								</a>
							)}
							{createPlan.isError && (
								<FormMessage tone="error">
									{createPlan.error instanceof ApiError
										? createPlan.error.message
										: 'Could not start the plan.'}
								</FormMessage>
							)}
						</div>
					)}
				</div>
			)}
		</section>
	);
}
