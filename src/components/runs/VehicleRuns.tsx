import { QueryClientProvider, useQuery, useQueryClient } from '@tanstack/react-query';
import { format } from 'date-fns';
import { useMemo, useState } from 'react';
import { buildReport } from '@/engine/report';
import { loggerColumns } from '@/lib/logger-csv';
import { newRunSchema } from '@/lib/schemas/events';
import { ApiError, getJson, postJson, sendJson } from '@/lib/client/api-client';
import { revisionsQueryOptions } from '@/lib/client/queries/builds';
import { fieldErrors } from '@/lib/client/form-errors';
import { getQueryClient } from '@/lib/client/query-client';
import type { RevisionDto } from '@/lib/client/queries/builds';
import { type EventDto, runDetailQueryOptions, runKeys, type RunDto, vehicleRunsQueryOptions } from '@/lib/client/queries/runs';
import { fmt } from '@/lib/format';
import { Button, Field, FormMessage } from '../ui/Field';
import { SamplesChart, ScoresOverTimeChart, ScoreVsVoltageChart } from './RunCharts';

export interface VehicleRunsProps {
	teamId: string;
	vehicleId: string;
	canEdit: boolean;
	initialRuns: RunDto[];
	events: EventDto[];
}

export function VehicleRuns(props: VehicleRunsProps) {
	return (
		<QueryClientProvider client={getQueryClient()}>
			<VehicleRunsView {...props} />
		</QueryClientProvider>
	);
}

export function VehicleRunsView({ teamId, vehicleId, canEdit, initialRuns, events }: VehicleRunsProps) {
	const runs = useQuery({ ...vehicleRunsQueryOptions(teamId, vehicleId), initialData: initialRuns });
	const [selected, setSelected] = useState<string | null>(initialRuns.at(-1)?.id ?? null);
	const [referenceId, setReferenceId] = useState<string | null>(null);
	const [compare, setCompare] = useState<[string | null, string | null]>([null, null]);
	const list = runs.data;
	const reference = list.find((r) => r.id === referenceId) ?? [...list].filter((r) => r.scoreDb !== null && r.minV !== null).sort((a, b) => b.scoreDb! - a.scoreDb!)[0] ?? null;

	return (
		<div className="flex flex-col gap-8">
			{canEdit && <LogRunForm teamId={teamId} vehicleId={vehicleId} events={events} onLogged={(id) => setSelected(id)} />}

			<section aria-labelledby="runs-heading">
				<div className="flex items-center gap-3">
					<h2 id="runs-heading" className="text-xl font-bold">Runs</h2>
					<a href={`/api/teams/${teamId}/runs/export.csv?vehicleId=${vehicleId}`} className="rounded-md border border-hairline bg-card px-2 py-0.5 text-sm hover:border-copper">Download CSV</a>
				</div>
				{list.length === 0 ? (
					<p className="mt-3 rounded-md border border-dashed border-hairline bg-card p-6 text-ink-soft">No runs logged yet.</p>
				) : (
					<div className="mt-3 overflow-x-auto rounded-md border border-hairline bg-card">
						<table className="w-full text-sm">
							<thead className="bg-paper text-xs text-ink-soft">
								<tr>
									<th className="px-3 py-2 text-left">When</th>
									<th className="px-3 py-2 text-left">Event</th>
									<th className="px-3 py-2 text-left">Revision</th>
									<th className="px-3 py-2 text-right">Score</th>
									<th className="px-3 py-2 text-right">Resting</th>
									<th className="px-3 py-2 text-right">Minimum</th>
									<th className="px-3 py-2 text-right">Frequency</th>
									<th className="px-3 py-2 text-left">Logger</th>
									<th className="px-3 py-2 text-left">Compare</th>
								</tr>
							</thead>
							<tbody className="num">
								{[...list].reverse().map((r) => (
									<tr key={r.id} className={`cursor-pointer border-t border-hairline ${selected === r.id ? 'bg-copper-tint/50' : 'hover:bg-paper'}`} onClick={() => setSelected(r.id)} data-run={r.id}>
										<td className="px-3 py-1.5 font-sans">
											<button type="button" className="underline-offset-2 hover:underline" onClick={() => setSelected(r.id)}>
												{format(new Date(r.ranAt), 'd MMM yyyy HH:mm')}
											</button>
										</td>
										<td className="px-3 py-1.5 font-sans">{r.eventName ?? <span className="text-ink-soft">practice</span>}</td>
										<td className="px-3 py-1.5">{r.revisionNumber ? `r${r.revisionNumber}` : '—'}</td>
										<td className="px-3 py-1.5 text-right">{fmt(r.scoreDb, 1)} <span className="text-xs text-ink-soft">dB</span></td>
										<td className="px-3 py-1.5 text-right">{fmt(r.restingV)} <span className="text-xs text-ink-soft">V</span></td>
										<td className="px-3 py-1.5 text-right">{fmt(r.minV)} <span className="text-xs text-ink-soft">V</span></td>
										<td className="px-3 py-1.5 text-right">{fmt(r.frequencyHz, 0)} <span className="text-xs text-ink-soft">Hz</span></td>
										<td className="px-3 py-1.5 font-sans">{r.hasLogger ? '✓ file' : '—'}</td>
										<td className="px-3 py-1.5 font-sans" onClick={(e) => e.stopPropagation()}>
											<label className="mr-2 text-xs"><input type="radio" name="cmp-a" checked={compare[0] === r.id} onChange={() => setCompare([r.id, compare[1]])} /> A</label>
											<label className="text-xs"><input type="radio" name="cmp-b" checked={compare[1] === r.id} onChange={() => setCompare([compare[0], r.id])} /> B</label>
										</td>
									</tr>
								))}
							</tbody>
						</table>
					</div>
				)}
			</section>

			{selected && <RunDetailPanel teamId={teamId} vehicleId={vehicleId} runId={selected} canEdit={canEdit} onDeleted={() => setSelected(null)} />}

			{list.some((r) => r.scoreDb !== null) && (
				<section aria-labelledby="compare-heading" className="grid gap-6 lg:grid-cols-2">
					<div>
						<h2 id="compare-heading" className="text-xl font-bold">Scores over time</h2>
						<div className="mt-3 rounded-md border border-hairline bg-card p-3">
							<ScoresOverTimeChart runs={list} />
						</div>
					</div>
					<div>
						<h2 className="text-xl font-bold">Did the volts turn into decibels?</h2>
						<div className="mt-3 rounded-md border border-hairline bg-card p-3">
							<ScoreVsVoltageChart runs={list} reference={reference} />
							<label className="mt-2 flex items-center gap-2 text-sm">
								Reference run
								<select value={reference?.id ?? ''} onChange={(e) => setReferenceId(e.target.value || null)} className="rounded border border-hairline px-2 py-1">
									{list.filter((r) => r.scoreDb !== null && r.minV !== null).map((r) => (
										<option key={r.id} value={r.id}>{format(new Date(r.ranAt), 'd MMM yyyy')} · {fmt(r.scoreDb, 1)} dB at {fmt(r.minV)} V</option>
									))}
								</select>
							</label>
						</div>
					</div>
				</section>
			)}

			{compare[0] && compare[1] && <SideBySide teamId={teamId} vehicleId={vehicleId} a={list.find((r) => r.id === compare[0])!} b={list.find((r) => r.id === compare[1])!} />}
		</div>
	);
}

function RunDetailPanel({ teamId, vehicleId, runId, canEdit, onDeleted }: { teamId: string; vehicleId: string; runId: string; canEdit: boolean; onDeleted: () => void }) {
	const qc = useQueryClient();
	const detail = useQuery(runDetailQueryOptions(teamId, runId));
	const photos = useQuery({ queryKey: ['photos', runId], queryFn: ({ signal }) => getJson<Array<{ id: string; name: string; thumbnailId: string | null }>>(`/api/teams/${teamId}/runs/${runId}/photos`, { signal }) });
	const [photoError, setPhotoError] = useState<string | null>(null);
	const [photoBusy, setPhotoBusy] = useState(false);
	const revisionId = detail.data?.run.revisionId ?? null;
	const revision = useQuery({
		queryKey: ['revision', revisionId],
		queryFn: ({ signal }) => getJson<RevisionDto>(`/api/teams/${teamId}/vehicles/${vehicleId}/revisions/${revisionId}`, { signal }),
		enabled: Boolean(revisionId),
	});
	const prediction = useMemo(() => {
		if (!revision.data) return null;
		const r = buildReport(revision.data.document, {}, { burpRun: false });
		return r.ok ? { minAmpV: Math.min(...r.amplifiers.map((a) => a.burpTerminalV)), status: r.burp.status } : null;
	}, [revision.data]);
	if (detail.isPending) return <p role="status" className="text-sm text-ink-soft">Loading the run…</p>;
	if (detail.isError) return <FormMessage tone="error">{detail.error instanceof ApiError ? detail.error.message : 'Could not load the run.'}</FormMessage>;
	const { run, samples, analysis } = detail.data;
	return (
		<section aria-labelledby="detail-heading" className="rounded-md border border-hairline bg-card p-4">
			<h2 id="detail-heading" className="text-xl font-bold">
				Run of {format(new Date(run.ranAt), 'd MMM yyyy HH:mm')} {run.eventName && <span className="font-normal text-ink-soft">· {run.eventName}</span>}
			</h2>
			{run.notes && <p className="mt-1 text-sm">{run.notes}</p>}
			{analysis ? (
				<>
					<div className="mt-3"><SamplesChart samples={samples} /></div>
					<dl className="num mt-3 grid grid-cols-2 gap-3 text-sm sm:grid-cols-4" aria-label="Analysis of the logger file">
						<Stat label="Minimum voltage" value={`${fmt(analysis.minVolts)} V`} />
						<Stat label="Mean voltage" value={`${fmt(analysis.meanVolts)} V`} />
						<Stat label="Peak current" value={`${fmt(analysis.peakAmps, 0)} A`} />
						<Stat label="Mean current" value={`${fmt(analysis.meanAmps, 0)} A`} />
						<Stat label="Energy drawn" value={`${fmt(analysis.energyWh, 2)} Wh`} />
						<Stat label="Duration" value={`${fmt(analysis.durationS, 1)} s`} />
						<Stat label="Supply resistance" value={analysis.effective ? `${fmt(analysis.effective.resistanceOhm * 1000, 2)} mΩ` : '—'} />
						<Stat label="Supply at no load" value={analysis.effective ? `${fmt(analysis.effective.openCircuitV)} V` : '—'} />
					</dl>
					<p className="mt-2 text-xs text-ink-soft">Supply resistance and no-load voltage: the least-squares line through the samples, V = V₀ − R·I ({analysis.effective ? `r² ${fmt(analysis.effective.r2, 3)}` : 'the current hardly moved'}).</p>
				</>
			) : (
				<p className="mt-3 text-sm text-ink-soft">No logger file for this run.</p>
			)}
			<div className="mt-4">
				<h3 className="font-semibold">Photos</h3>
				{photos.data && photos.data.length === 0 && <p className="text-sm text-ink-soft">No photos of this run.</p>}
				<ul className="mt-2 flex flex-wrap gap-2">
					{photos.data?.map((ph) => (
						<li key={ph.id}>
							<a href={`/api/teams/${teamId}/files/${ph.id}`} target="_blank" rel="noreferrer">
								<img src={`/api/teams/${teamId}/files/${ph.thumbnailId ?? ph.id}`} alt={ph.name} className="h-24 rounded-md border border-hairline object-cover" loading="lazy" />
							</a>
						</li>
					))}
				</ul>
				{canEdit && (
					<label className="mt-2 inline-flex items-center gap-2 text-sm">
						<span className="font-semibold">Add a photo (JPEG, PNG or WebP, up to 10 MB)</span>
						<input
							type="file"
							accept="image/jpeg,image/png,image/webp"
							disabled={photoBusy}
							onChange={async (e) => {
								const f = e.target.files?.[0];
								if (!f) return;
								setPhotoBusy(true);
								setPhotoError(null);
								const form = new FormData();
								form.set('file', f);
								const res = await fetch(`/api/teams/${teamId}/runs/${runId}/photos`, { method: 'POST', body: form });
								if (!res.ok) setPhotoError(((await res.json().catch(() => ({}))) as { detail?: string }).detail ?? 'The photo was refused');
								await qc.invalidateQueries({ queryKey: ['photos', runId] });
								setPhotoBusy(false);
								e.target.value = '';
							}}
						/>
					</label>
				)}
				{photoError && <FormMessage tone="error">{photoError}</FormMessage>}
			</div>
			{canEdit && <EditRunForm teamId={teamId} vehicleId={vehicleId} run={run} />}
			{canEdit && (
				<div className="mt-4">
					<Button
						variant="danger"
						onClick={async () => {
							if (!window.confirm('Delete this run, its logger samples and its photos?')) return;
							await fetch(`/api/teams/${teamId}/runs/${runId}`, { method: 'DELETE' });
							await qc.invalidateQueries({ queryKey: runKeys.byVehicle(vehicleId) });
							onDeleted();
						}}
					>
						Delete this run
					</Button>
				</div>
			)}
			<div className="mt-3 rounded-md bg-paper p-3 text-sm" aria-label="Model beside the measurement">
				<strong>Model beside the measurement:</strong>{' '}
				{!revisionId ? 'no revision linked to this run.' : !prediction ? 'computing…' : (
					<>
						revision r{run.revisionNumber} predicts the lowest amplifier at <span className="num font-semibold">{prediction.status === 'collapse' ? 'collapse' : `${fmt(prediction.minAmpV)} V`}</span> under a full burp at 1500 rpm; measured minimum <span className="num font-semibold">{fmt(analysis?.minVolts ?? run.minV)} V</span>.
					</>
				)}
			</div>
		</section>
	);
}

function Stat({ label, value }: { label: string; value: string }) {
	return (
		<div className="rounded-md border border-hairline p-2">
			<dt className="font-sans text-xs text-ink-soft">{label}</dt>
			<dd className="text-lg font-semibold">{value}</dd>
		</div>
	);
}

function SideBySide({ teamId, vehicleId, a, b }: { teamId: string; vehicleId: string; a: RunDto; b: RunDto }) {
	const diff = useQuery({
		queryKey: ['diff', a.revisionId, b.revisionId],
		queryFn: ({ signal }) => getJson<{ changes: Array<{ group: string; label: string; kind: string; fields: Array<{ field: string }> }> }>(`/api/teams/${teamId}/vehicles/${vehicleId}/diff?from=${a.revisionId}&to=${b.revisionId}`, { signal }),
		enabled: Boolean(a.revisionId && b.revisionId && a.revisionId !== b.revisionId),
	});
	const row = (label: string, f: (r: RunDto) => string) => (
		<tr className="border-t border-hairline"><th className="px-3 py-1.5 text-left font-normal text-ink-soft">{label}</th><td className="num px-3 py-1.5">{f(a)}</td><td className="num px-3 py-1.5">{f(b)}</td></tr>
	);
	return (
		<section aria-labelledby="sbs-heading">
			<h2 id="sbs-heading" className="text-xl font-bold">Two runs side by side</h2>
			<table className="mt-3 w-full rounded-md border border-hairline bg-card text-sm">
				<thead className="bg-paper text-xs text-ink-soft"><tr><th className="px-3 py-2" /><th className="px-3 py-2 text-left">A</th><th className="px-3 py-2 text-left">B</th></tr></thead>
				<tbody>
					{row('When', (r) => format(new Date(r.ranAt), 'd MMM yyyy HH:mm'))}
					{row('Score', (r) => `${fmt(r.scoreDb, 1)} dB`)}
					{row('Resting / minimum', (r) => `${fmt(r.restingV)} / ${fmt(r.minV)} V`)}
					{row('Revision', (r) => (r.revisionNumber ? `r${r.revisionNumber}` : '—'))}
				</tbody>
			</table>
			<p className="mt-2 text-sm">
				{a.revisionId === b.revisionId ? 'Both runs were made on the same revision.' : diff.data ? `Between their revisions: ${diff.data.changes.map((c) => `${c.label} (${c.kind})`).join(', ') || 'no change to the network'}.` : 'Comparing their revisions…'}
			</p>
		</section>
	);
}

function LogRunForm({ teamId, vehicleId, events, onLogged }: { teamId: string; vehicleId: string; events: EventDto[]; onLogged: (id: string) => void }) {
	const qc = useQueryClient();
	const now = new Date();
	const [values, setValues] = useState({ ranAt: format(now, "yyyy-MM-dd'T'HH:mm"), eventId: '', scoreDb: '', frequencyHz: '', restingV: '', minV: '', ambientC: '', notes: '' });
	const [file, setFile] = useState<File | null>(null);
	const [columns, setColumns] = useState<string[]>([]);
	const [mapping, setMapping] = useState({ timeColumn: '', voltsColumn: '', ampsColumn: '', timeUnit: 's' });
	const [errors, setErrors] = useState<Record<string, string>>({});
	const [progress, setProgress] = useState<number | null>(null);
	const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
	const set = (k: keyof typeof values) => (e: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) => setValues((v) => ({ ...v, [k]: e.target.value }));
	const num = (s: string) => (s.trim() === '' ? null : Number(s));

	async function pick(f: File | null) {
		setFile(f);
		setColumns([]);
		if (!f) return;
		const head = await f.slice(0, 4096).text();
		const cols = loggerColumns(head);
		setColumns(cols);
		const guess = (re: RegExp) => cols.find((c) => re.test(c)) ?? '';
		setMapping({ timeColumn: guess(/^t(ime)?|sec|ms/i), voltsColumn: guess(/volt|^v/i), ampsColumn: guess(/amp|^a$|^i$|current/i), timeUnit: cols.some((c) => /ms/i.test(c)) ? 'ms' : 's' });
	}

	function uploadFile(runId: string): Promise<void> {
		return new Promise((resolve, reject) => {
			const form = new FormData();
			form.set('file', file!);
			for (const [k, v] of Object.entries(mapping)) form.set(k, v);
			const xhr = new XMLHttpRequest();
			xhr.open('POST', `/api/teams/${teamId}/runs/${runId}/logger`);
			xhr.upload.onprogress = (e) => e.lengthComputable && setProgress(Math.round((100 * e.loaded) / e.total));
			xhr.onload = () => {
				if (xhr.status < 300) return resolve();
				let detail = `Upload failed (${xhr.status})`;
				try {
					detail = JSON.parse(xhr.responseText).detail ?? detail;
				} catch {
					// not JSON
				}
				reject(new Error(detail));
			};
			xhr.onerror = () => reject(new Error('The upload was interrupted.'));
			xhr.send(form);
		});
	}

	async function submit(event: React.FormEvent) {
		event.preventDefault();
		setMessage(null);
		const input = {
			vehicleId,
			eventId: values.eventId || null,
			ranAt: new Date(values.ranAt).toISOString(),
			scoreDb: num(values.scoreDb),
			frequencyHz: num(values.frequencyHz),
			restingV: num(values.restingV),
			minV: num(values.minV),
			ambientC: num(values.ambientC),
			notes: values.notes,
		};
		const parsed = newRunSchema.safeParse(input);
		if (!parsed.success) return setErrors(fieldErrors(parsed.error));
		setErrors({});
		try {
			const run = await postJson<RunDto>(`/api/teams/${teamId}/runs`, parsed.data);
			if (file) {
				setProgress(0);
				try {
					await uploadFile(run.id);
				} catch (e) {
					setMessage({ tone: 'error', text: `The run is logged, but the logger file was refused: ${(e as Error).message}` });
				}
				setProgress(null);
			}
			await qc.invalidateQueries({ queryKey: runKeys.byVehicle(vehicleId) });
			await qc.invalidateQueries({ queryKey: runKeys.detail(run.id) });
			onLogged(run.id);
			setMessage((m) => m ?? { tone: 'ok', text: `Run logged${run.revisionNumber ? ` against revision r${run.revisionNumber}` : ''}.` });
		} catch (e) {
			if (e instanceof ApiError) setErrors(e.byField());
			setMessage({ tone: 'error', text: e instanceof ApiError ? e.message : 'Could not reach the server.' });
		}
	}

	return (
		<section aria-labelledby="log-heading">
			<h2 id="log-heading" className="text-xl font-bold">Log a run</h2>
			<form onSubmit={submit} noValidate aria-label="Log a run" className="mt-3 flex flex-col gap-3 rounded-md border border-hairline bg-card p-4">
				<div className="grid gap-3 sm:grid-cols-3 lg:grid-cols-4">
					<Field label="When" type="datetime-local" value={values.ranAt} onChange={set('ranAt')} error={errors.ranAt} />
					<div className="flex flex-col gap-1">
						<label htmlFor="run-event" className="text-sm font-semibold">Event</label>
						<select id="run-event" value={values.eventId} onChange={set('eventId')} className="rounded-md border border-hairline bg-card px-3 py-2">
							<option value="">practice (no event)</option>
							{events.map((e) => <option key={e.id} value={e.id}>{e.name} ({e.startsOn})</option>)}
						</select>
					</div>
					<Field label="Score (dB)" inputMode="decimal" value={values.scoreDb} onChange={set('scoreDb')} error={errors.scoreDb} />
					<Field label="Frequency (Hz)" inputMode="decimal" value={values.frequencyHz} onChange={set('frequencyHz')} error={errors.frequencyHz} />
					<Field label="Resting voltage (V)" inputMode="decimal" value={values.restingV} onChange={set('restingV')} error={errors.restingV} />
					<Field label="Minimum voltage (V)" inputMode="decimal" value={values.minV} onChange={set('minV')} error={errors.minV} />
					<Field label="Ambient (°C)" inputMode="decimal" value={values.ambientC} onChange={set('ambientC')} error={errors.ambientC} />
					<Field label="Notes" value={values.notes} onChange={set('notes')} error={errors.notes} />
				</div>
				<div className="flex flex-col gap-2 rounded-md border border-dashed border-hairline p-3">
					<label htmlFor="logger-file" className="text-sm font-semibold">Logger file (CSV of time, volts, amps) — optional</label>
					<input id="logger-file" type="file" accept=".csv,text/csv" onChange={(e) => void pick(e.target.files?.[0] ?? null)} />
					{file && columns.length > 0 && (
						<div className="flex flex-wrap gap-3 text-sm">
							{(['timeColumn', 'voltsColumn', 'ampsColumn'] as const).map((k) => (
								<label key={k} className="flex items-center gap-1">
									{k === 'timeColumn' ? 'Time' : k === 'voltsColumn' ? 'Volts' : 'Amps'}
									<select aria-label={`${k === 'timeColumn' ? 'Time' : k === 'voltsColumn' ? 'Volts' : 'Amps'} column`} value={mapping[k]} onChange={(e) => setMapping((m) => ({ ...m, [k]: e.target.value }))} className="rounded border border-hairline px-1 py-0.5">
										<option value="">—</option>
										{columns.map((c) => <option key={c} value={c}>{c}</option>)}
									</select>
								</label>
							))}
							<label className="flex items-center gap-1">
								Time in
								<select aria-label="Time unit" value={mapping.timeUnit} onChange={(e) => setMapping((m) => ({ ...m, timeUnit: e.target.value }))} className="rounded border border-hairline px-1 py-0.5">
									<option value="s">seconds</option>
									<option value="ms">milliseconds</option>
								</select>
							</label>
						</div>
					)}
					{file && columns.length === 0 && <p className="text-sm text-brick">✕ No header row found in this file.</p>}
					{progress !== null && (
						<div role="progressbar" aria-valuenow={progress} aria-valuemin={0} aria-valuemax={100} aria-label="Upload progress" className="h-2 w-full overflow-hidden rounded bg-paper">
							<div className="h-full bg-teal" style={{ width: `${progress}%` }} />
						</div>
					)}
				</div>
				<div className="flex items-center gap-3">
					<Button type="submit" busy={progress !== null}>Log the run</Button>
					{message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
				</div>
			</form>
		</section>
	);
}



function EditRunForm({ teamId, vehicleId, run }: { teamId: string; vehicleId: string; run: RunDto }) {
	const qc = useQueryClient();
	const [open, setOpen] = useState(false);
	const revisions = useQuery({ ...revisionsQueryOptions(teamId, vehicleId), enabled: open });
	const [values, setValues] = useState({ scoreDb: run.scoreDb?.toString() ?? '', restingV: run.restingV?.toString() ?? '', minV: run.minV?.toString() ?? '', notes: run.notes, revisionId: run.revisionId ?? '' });
	const [state, setState] = useState<{ busy: boolean; error: string | null; errors: Record<string, string> }>({ busy: false, error: null, errors: {} });
	if (!open) return <Button variant="secondary" className="mt-4" onClick={() => setOpen(true)}>Edit this run</Button>;
	const num = (x: string) => (x.trim() === '' ? null : Number(x));
	const set = (k: keyof typeof values) => (e: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) => setValues((v) => ({ ...v, [k]: e.target.value }));
	return (
		<form
			noValidate
			aria-label="Edit the run"
			className="mt-4 flex flex-wrap items-end gap-3 rounded-md border border-hairline p-3"
			onSubmit={async (e) => {
				e.preventDefault();
				setState({ busy: true, error: null, errors: {} });
				try {
					await sendJson(`/api/teams/${teamId}/runs/${run.id}`, 'PATCH', { scoreDb: num(values.scoreDb), restingV: num(values.restingV), minV: num(values.minV), notes: values.notes, revisionId: values.revisionId || null });
					await qc.invalidateQueries({ queryKey: runKeys.all });
					setOpen(false);
				} catch (err) {
					setState({ busy: false, error: err instanceof ApiError ? err.message : 'Could not save', errors: err instanceof ApiError ? err.byField() : {} });
				}
			}}
		>
			<Field label="Score (dB)" inputMode="decimal" value={values.scoreDb} onChange={set('scoreDb')} error={state.errors.scoreDb} className="w-32" />
			<Field label="Resting (V)" inputMode="decimal" value={values.restingV} onChange={set('restingV')} error={state.errors.restingV} className="w-32" />
			<Field label="Minimum (V)" inputMode="decimal" value={values.minV} onChange={set('minV')} error={state.errors.minV} className="w-32" />
			<div className="flex flex-col gap-1">
				<label htmlFor={`rev-${run.id}`} className="text-sm font-semibold">Revision in force</label>
				<select id={`rev-${run.id}`} value={values.revisionId} onChange={set('revisionId')} className="rounded-md border border-hairline bg-card px-3 py-2">
					<option value="">none</option>
					{revisions.data?.map((r) => <option key={r.id} value={r.id}>r{r.number} · {r.message.slice(0, 40)}</option>)}
					{!revisions.data && run.revisionId && <option value={run.revisionId}>r{run.revisionNumber}</option>}
				</select>
			</div>
			<Field label="Notes" value={values.notes} onChange={set('notes')} error={state.errors.notes} className="min-w-64 flex-1" />
			<Button type="submit" busy={state.busy}>Save</Button>
			<Button type="button" variant="secondary" onClick={() => setOpen(false)}>Cancel</Button>
			{state.error && <FormMessage tone="error">{state.error}</FormMessage>}
		</form>
	);
}
