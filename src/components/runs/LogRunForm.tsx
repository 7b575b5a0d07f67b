import { format, formatISO } from 'date-fns';
import { useEffect, useState } from 'react';
import { Button, Field, FormMessage } from '@/components/ui/Field';
import { ApiError } from '@/lib/client/api-client';
import { currentUserId, enqueue, isOffline, onSent } from '@/lib/client/outbox';
import { lastVehicles } from '@/lib/client/draft-store';
import { fieldErrors } from '@/lib/client/form-errors';
import { type EventDto, useLogRun, useUploadLogger } from '@/lib/client/queries/runs';
import { loggerColumns } from '@/lib/logger-csv';
import { measurementsFromTexts, measurementTexts } from '@/lib/schemas/run-measurements';
import { newRunSchema, revisionInForceAt } from '@/lib/schemas/runs';
import type { RevisionSummary } from '@/lib/schemas/vehicles';
import { MeasurementFields } from './MeasurementFields';
import { useLocalFormat } from '@/lib/client/local-time';

const MAPPED = [
	{ key: 'timeColumn', label: 'Time' },
	{ key: 'voltsColumn', label: 'Volts' },
	{ key: 'ampsColumn', label: 'Amps' },
] as const;

/** Logs a run, with an optional logger file (its columns mapped, its upload shown as it goes). */
export function LogRunForm({
	teamId,
	vehicleId,
	events,
	revisions,
	onLogged,
}: {
	teamId: string;
	vehicleId: string;
	events: EventDto[];
	/** The build's revisions, newest first, for showing which one the run will be tied to. */
	revisions: RevisionSummary[];
	onLogged: (id: string) => void;
}) {
	const logRun = useLogRun(teamId, vehicleId);
	const uploadLogger = useUploadLogger(teamId, vehicleId);
	const fmtTime = useLocalFormat();
	const now = () => format(new Date(), "yyyy-MM-dd'T'HH:mm:ss");
	// The device's own clock and zone: set once mounted, so the server's page and the first render agree.
	const [ranAt, setRanAt] = useState('');
	useEffect(() => setRanAt(now()), []);
	// At the lanes the run belongs to the event happening today (by the device's own date): chosen
	// for the member once mounted (the server does not know the device's day), changeable.
	useEffect(() => {
		const today = format(new Date(), 'yyyy-MM-dd');
		const on = events.find((e) => e.startsOn <= today && today <= e.endsOn);
		if (on) setEventId((current) => current || on.id);
	}, [events]);
	const [duplicateOf, setDuplicateOf] = useState<string | null>(null);
	/** Made once per run being logged: a retry (or the outbox) sends the same key, never a second run. */
	const [clientKey, setClientKey] = useState(() => crypto.randomUUID());
	const [eventId, setEventId] = useState('');
	/** '' ties the run to the revision in force at its time; otherwise the revision chosen. */
	const [revisionChoice, setRevisionChoice] = useState('');
	const [numbers, setNumbers] = useState(() => measurementTexts());
	const [notes, setNotes] = useState('');
	const [file, setFile] = useState<File | null>(null);
	const [columns, setColumns] = useState<string[]>([]);
	const [mapping, setMapping] = useState({
		timeColumn: '',
		voltsColumn: '',
		ampsColumn: '',
		timeUnit: 's',
	});
	const [errors, setErrors] = useState<Record<string, string>>({});
	const [progress, setProgress] = useState<number | null>(null);
	const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
	/** The run last kept on the device: its notice gives way to "sent" once the outbox sends it. */
	const [keptId, setKeptId] = useState<string | null>(null);
	useEffect(() => {
		if (!keptId) return;
		return onSent((e) => {
			if (e.id !== keptId) return;
			setKeptId(null);
			setMessage({ tone: 'ok', text: 'The run kept on this device has been sent.' });
		});
	}, [keptId]);

	async function pick(f: File | null) {
		setFile(f);
		setColumns([]);
		if (!f) return;
		const cols = loggerColumns(await f.slice(0, 4096).text());
		setColumns(cols);
		const guess = (re: RegExp) => cols.find((c) => re.test(c)) ?? '';
		setMapping({
			timeColumn: guess(/^t(ime)?|sec|ms/i),
			voltsColumn: guess(/volt|^v/i),
			ampsColumn: guess(/amp|^a$|^i$|current/i),
			timeUnit: cols.some((c) => /ms/i.test(c)) ? 'ms' : 's',
		});
	}

	function clear() {
		setRanAt(now());
		setClientKey(crypto.randomUUID());
		setRevisionChoice('');
		setNumbers(measurementTexts());
		setNotes('');
		setFile(null);
		setColumns([]);
		setDuplicateOf(null);
		const input = document.getElementById('logger-file') as HTMLInputElement | null;
		if (input) input.value = '';
	}

	const inForce = revisionInForceAt(revisions, new Date(ranAt));
	const chosen = revisions.find((r) => r.id === revisionChoice) ?? inForce;

	async function submit(event: React.FormEvent | null, allowDuplicate = false) {
		event?.preventDefault();
		setMessage(null);
		setDuplicateOf(null);
		const when = new Date(ranAt);
		const parsed = newRunSchema.safeParse({
			vehicleId,
			eventId: eventId || null,
			// To the second, with this device's offset, so the run lands on the revision in force then.
			ranAt: Number.isNaN(when.getTime()) ? '' : formatISO(when),
			revisionId: revisionChoice || undefined,
			clientKey,
			allowDuplicate,
			...measurementsFromTexts(numbers),
			notes,
		});
		if (!parsed.success) return setErrors(fieldErrors(parsed.error));
		setErrors({});
		const keep = async (runId?: string) => {
			const userId = currentUserId();
			if (!userId) return false;
			await enqueue({
				kind: 'run',
				id: clientKey,
				teamId,
				vehicleId,
				userId,
				createdAt: new Date().toISOString(),
				state: 'waiting',
				body: { ...parsed.data, clientKey },
				file: file ? { blob: file, name: file.name, mapping } : undefined,
				runId,
			});
			setKeptId(clientKey);
			lastVehicles.store(teamId, { vehicleId });
			clear();
			setMessage({
				tone: 'ok',
				text: runId
					? 'The run is logged; its logger file is kept on this device and goes out when the connection returns.'
					: 'No connection: the run is kept on this device, marked as not yet sent, and goes out by itself when the connection returns.',
			});
			return true;
		};
		// No connection at all: kept at once, not after a request that cannot be answered.
		if (typeof navigator !== 'undefined' && !navigator.onLine && (await keep())) return;
		try {
			let run;
			try {
				run = await logRun.mutateAsync(parsed.data);
			} catch (e) {
				if (isOffline(e) && (await keep())) return;
				throw e;
			}
			let note: string | null = null;
			if (file) {
				setProgress(0);
				try {
					await uploadLogger.mutateAsync({ runId: run.id, file, mapping, onProgress: setProgress });
				} catch (e) {
					setProgress(null);
					if (isOffline(e) && (await keep(run.id))) return onLogged(run.id);
					note = `The run is logged, but the logger file was refused: ${(e as Error).message}`;
				}
				setProgress(null);
			}
			onLogged(run.id);
			// Remembered on this device, for this member: the day page puts this vehicle first.
			lastVehicles.store(teamId, { vehicleId });
			clear();
			setMessage(
				note
					? { tone: 'error', text: note }
					: {
							tone: 'ok',
							text: `Run logged${run.revisionNumber ? ` against revision r${run.revisionNumber}` : ''}.`,
						},
			);
		} catch (e) {
			if (e instanceof ApiError && e.code === 'possible_duplicate') {
				setDuplicateOf(e.message);
				return;
			}
			if (e instanceof ApiError) setErrors(e.byField());
			setMessage({
				tone: 'error',
				text: e instanceof ApiError ? e.message : 'Could not reach the server.',
			});
		}
	}

	return (
		<section aria-labelledby="log-heading">
			<h2 id="log-heading" className="text-xl font-bold">
				Log a run
			</h2>
			<form
				onSubmit={submit}
				noValidate
				aria-label="Log a run"
				className="mt-3 flex flex-col gap-3 rounded-md border border-hairline bg-card p-4"
			>
				<div className="grid grid-cols-1 gap-3 sm:grid-cols-3 lg:grid-cols-4">
					<Field
						label="When"
						type="datetime-local"
						step={1}
						value={ranAt}
						onChange={(e) => setRanAt(e.target.value)}
						error={errors.ranAt}
					/>
					<div className="flex flex-col gap-1 sm:col-span-2">
						<label htmlFor="run-revision" className="text-sm font-semibold">
							Build revision
						</label>
						<select
							id="run-revision"
							value={revisionChoice}
							onChange={(e) => setRevisionChoice(e.target.value)}
							aria-describedby="run-revision-hint"
							className="w-full min-w-0 rounded-md border border-hairline bg-card px-3 py-2"
						>
							<option value="">
								{inForce
									? `In force then: r${inForce.number} · ${inForce.message}`
									: 'In force then: none saved yet'}
							</option>
							{revisions.map((r) => (
								<option key={r.id} value={r.id}>
									r{r.number} · {r.message} ({fmtTime(r.createdAt, 'd MMM HH:mm:ss')})
								</option>
							))}
						</select>
						<p id="run-revision-hint" className="text-sm text-ink-soft" data-revision-hint>
							{chosen
								? `The run will be tied to r${chosen.number}, saved ${fmtTime(chosen.createdAt, 'd MMM yyyy HH:mm:ss')}${revisionChoice ? ' (chosen by hand)' : ''}.`
								: 'No revision of the build was saved by this time: the run will have none.'}
						</p>
					</div>
					<div className="flex flex-col gap-1">
						<label htmlFor="run-event" className="text-sm font-semibold">
							Event
						</label>
						<select
							id="run-event"
							value={eventId}
							onChange={(e) => setEventId(e.target.value)}
							className="w-full min-w-0 rounded-md border border-hairline bg-card px-3 py-2"
						>
							<option value="">practice (no event)</option>
							{events.map((e) => (
								<option key={e.id} value={e.id}>
									{e.name} ({e.startsOn})
								</option>
							))}
						</select>
					</div>
					<MeasurementFields
						values={numbers}
						errors={errors}
						onChange={(f, v) => setNumbers((n) => ({ ...n, [f]: v }))}
					/>
					<Field
						label="Notes"
						value={notes}
						onChange={(e) => setNotes(e.target.value)}
						error={errors.notes}
					/>
				</div>
				<div className="flex flex-col gap-2 rounded-md border border-dashed border-hairline p-3">
					<label htmlFor="logger-file" className="text-sm font-semibold">
						Logger file (CSV of time, volts, amps) — optional
					</label>
					<input
						id="logger-file"
						type="file"
						accept=".csv,text/csv"
						onChange={(e) => void pick(e.target.files?.[0] ?? null)}
					/>
					{file && columns.length > 0 && (
						<div className="flex flex-wrap gap-3 text-sm">
							{MAPPED.map(({ key, label }) => (
								<label key={key} className="flex items-center gap-1">
									{label}
									<select
										aria-label={`${label} column`}
										value={mapping[key]}
										onChange={(e) => setMapping((m) => ({ ...m, [key]: e.target.value }))}
										className="rounded border border-hairline px-1 py-0.5"
									>
										<option value="">—</option>
										{columns.map((c) => (
											<option key={c} value={c}>
												{c}
											</option>
										))}
									</select>
								</label>
							))}
							<label className="flex items-center gap-1">
								Time in
								<select
									aria-label="Time unit"
									value={mapping.timeUnit}
									onChange={(e) => setMapping((m) => ({ ...m, timeUnit: e.target.value }))}
									className="rounded border border-hairline px-1 py-0.5"
								>
									<option value="s">seconds</option>
									<option value="ms">milliseconds</option>
								</select>
							</label>
						</div>
					)}
					{file && columns.length === 0 && (
						<p className="text-sm text-brick">✕ No header row found in this file.</p>
					)}
					{progress !== null && (
						<div
							role="progressbar"
							aria-valuenow={progress}
							aria-valuemin={0}
							aria-valuemax={100}
							aria-label="Upload progress"
							className="h-2 w-full overflow-hidden rounded bg-paper"
						>
							<div className="h-full bg-teal" style={{ width: `${progress}%` }} />
						</div>
					)}
				</div>
				<div className="flex flex-wrap items-center gap-3">
					<Button type="submit" busy={logRun.isPending || progress !== null}>
						Log the run
					</Button>
					{message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
				</div>
				{duplicateOf && (
					<div
						role="alert"
						className="flex flex-wrap items-center gap-3 rounded-md border border-amber bg-amber-tint p-3 text-sm text-amber-text"
					>
						<span>⚠ {duplicateOf}. Is this a second run?</span>
						<Button type="button" variant="secondary" onClick={() => void submit(null, true)}>
							Log it anyway
						</Button>
						<Button type="button" variant="secondary" onClick={clear}>
							Discard this entry
						</Button>
					</div>
				)}
			</form>
		</section>
	);
}
