import { useQuery } from '@tanstack/react-query';
import { useMemo } from 'react';
import { Button, FormMessage } from '@/components/ui/Field';
import { buildReport } from '@/engine/browser';
import { ApiError } from '@/lib/client/api-client';
import {
	runDetailQueryOptions,
	runPhotosQueryOptions,
	runRevisionQueryOptions,
	useDeleteRun,
	useUploadPhoto,
} from '@/lib/client/queries/runs';
import { MISMATCH_MARGIN_V } from '@/lib/schemas/runs';
import { fmt } from '@/lib/format';
import { CommentThreadView } from '@/components/comments/CommentThread';
import { CalibrationSection } from './CalibrationSection';
import { EditRunForm } from './EditRunForm';
import { SamplesChart } from './RunCharts';
import { useLocalFormat } from '@/lib/client/local-time';

/** One run: its logger trace and analysis, photos, the model beside the measurement, edit and delete. */
export function RunDetailPanel({
	teamId,
	vehicleId,
	runId,
	canEdit,
	onDeleted,
}: {
	teamId: string;
	vehicleId: string;
	runId: string;
	canEdit: boolean;
	onDeleted: () => void;
}) {
	const detail = useQuery(runDetailQueryOptions(teamId, runId));
	const fmtTime = useLocalFormat();
	const revisionId = detail.data?.run.revisionId ?? null;
	const revision = useQuery(runRevisionQueryOptions(teamId, vehicleId, revisionId));
	const deleteRun = useDeleteRun(teamId, vehicleId);
	const prediction = useMemo(() => {
		if (!revision.data) return null;
		const r = buildReport(revision.data.document, {}, { burpRun: false });
		return r.ok
			? { minAmpV: Math.min(...r.amplifiers.map((a) => a.burpTerminalV)), status: r.burp.status }
			: null;
	}, [revision.data]);
	if (detail.isPending)
		return (
			<p role="status" className="text-sm text-ink-soft">
				Loading the run…
			</p>
		);
	if (detail.isError)
		return (
			<FormMessage tone="error">
				{detail.error instanceof ApiError ? detail.error.message : 'Could not load the run.'}
			</FormMessage>
		);
	const { run, samples, analysis } = detail.data;
	return (
		<section
			aria-labelledby="detail-heading"
			className="rounded-md border border-hairline bg-card p-4"
		>
			<h2 id="detail-heading" className="text-xl font-bold">
				Run of {fmtTime(run.ranAt, 'd MMM yyyy HH:mm')}{' '}
				{run.eventName && <span className="font-normal text-ink-soft">· {run.eventName}</span>}
			</h2>
			{run.notes && <p className="mt-1 text-sm">{run.notes}</p>}
			{run.mismatches.map((m) => (
				<p
					key={m.field}
					role="note"
					className="mt-2 rounded-md border border-amber bg-amber-tint p-2 text-sm text-amber-text"
				>
					⚠ The typed {m.field === 'minV' ? 'minimum' : 'resting'} voltage ({fmt(m.typedV)} V)
					differs from the logger file&apos;s ({fmt(m.loggedV)} V) by more than{' '}
					{fmt(MISMATCH_MARGIN_V, 1)} V. Both are kept; the analysis below uses the logger&apos;s.
				</p>
			))}
			{analysis ? (
				<>
					<div className="mt-3">
						<SamplesChart samples={samples} />
					</div>
					<dl
						className="num mt-3 grid grid-cols-2 gap-3 text-sm sm:grid-cols-4"
						aria-label="Analysis of the logger file"
					>
						<Stat label="Minimum voltage" value={`${fmt(analysis.minVolts)} V`} />
						<Stat label="Mean voltage" value={`${fmt(analysis.meanVolts)} V`} />
						<Stat label="Peak current" value={`${fmt(analysis.peakAmps, 0)} A`} />
						<Stat label="Mean current" value={`${fmt(analysis.meanAmps, 0)} A`} />
						<Stat label="Energy drawn" value={`${fmt(analysis.energyWh, 2)} Wh`} />
						<Stat label="Duration" value={`${fmt(analysis.durationS, 1)} s`} />
						<Stat
							label="Supply resistance"
							value={
								analysis.effective ? `${fmt(analysis.effective.resistanceOhm * 1000, 2)} mΩ` : '—'
							}
						/>
						<Stat
							label="Supply at no load"
							value={analysis.effective ? `${fmt(analysis.effective.openCircuitV)} V` : '—'}
						/>
					</dl>
					<p className="mt-2 text-xs text-ink-soft">
						Supply resistance and no-load voltage: the least-squares line through the samples, V =
						V₀ − R·I (
						{analysis.effective
							? `r² ${fmt(analysis.effective.r2, 3)}`
							: 'the current hardly moved'}
						).
					</p>
				</>
			) : (
				<p className="mt-3 text-sm text-ink-soft">No logger file for this run.</p>
			)}
			<RunPhotos teamId={teamId} runId={runId} canEdit={canEdit} />
			<CommentThreadView
				teamId={teamId}
				subject={{ on: 'run', id: runId }}
				title="Discussion of this run"
			/>
			{canEdit && <EditRunForm teamId={teamId} vehicleId={vehicleId} run={run} />}
			{canEdit && (
				<div className="mt-4">
					<Button
						variant="danger"
						busy={deleteRun.isPending}
						onClick={() => {
							if (!window.confirm('Delete this run, its logger samples and its photos?')) return;
							deleteRun.mutate(runId, { onSuccess: onDeleted });
						}}
					>
						Delete this run
					</Button>
					{deleteRun.isError && (
						<FormMessage tone="error">{(deleteRun.error as Error).message}</FormMessage>
					)}
				</div>
			)}
			<div
				className="mt-3 rounded-md bg-paper p-3 text-sm"
				aria-label="Model beside the measurement"
			>
				<strong>Model beside the measurement:</strong>{' '}
				{!revisionId ? (
					'no revision linked to this run.'
				) : !prediction ? (
					'computing…'
				) : (
					<>
						revision r{run.revisionNumber} predicts the lowest amplifier at{' '}
						<span className="num font-semibold">
							{prediction.status === 'collapse' ? 'collapse' : `${fmt(prediction.minAmpV)} V`}
						</span>{' '}
						under a full burp at 1500 rpm; measured minimum{' '}
						<span className="num font-semibold">{fmt(analysis?.minVolts ?? run.minV)} V</span>.
					</>
				)}
			</div>
			{analysis && revision.data && run.revisionId && run.revisionNumber !== null && (
				<CalibrationSection
					teamId={teamId}
					vehicleId={vehicleId}
					revision={{
						id: run.revisionId,
						number: run.revisionNumber,
						document: revision.data.document,
					}}
					samples={samples}
					canPlan={canEdit}
					runLabel={fmtTime(run.ranAt, 'd MMM yyyy HH:mm')}
				/>
			)}
		</section>
	);
}

function RunPhotos({
	teamId,
	runId,
	canEdit,
}: {
	teamId: string;
	runId: string;
	canEdit: boolean;
}) {
	const photos = useQuery(runPhotosQueryOptions(teamId, runId));
	const upload = useUploadPhoto(teamId, runId);
	return (
		<div className="mt-4">
			<h3 className="font-semibold">Photos</h3>
			{photos.data && photos.data.length === 0 && (
				<p className="text-sm text-ink-soft">No photos of this run.</p>
			)}
			<ul className="mt-2 flex flex-wrap gap-2">
				{photos.data?.map((ph) => (
					<li key={ph.id}>
						<a href={`/api/teams/${teamId}/files/${ph.id}`} target="_blank" rel="noreferrer">
							<img
								src={`/api/teams/${teamId}/files/${ph.thumbnailId ?? ph.id}`}
								alt={ph.name}
								className="h-24 rounded-md border border-hairline object-cover"
								loading="lazy"
							/>
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
						disabled={upload.isPending}
						onChange={(e) => {
							const f = e.target.files?.[0];
							const input = e.target;
							if (f) upload.mutate(f, { onSettled: () => (input.value = '') });
						}}
					/>
				</label>
			)}
			{upload.isError && (
				<FormMessage tone="error">
					{upload.error instanceof ApiError ? upload.error.message : 'The photo was refused'}
				</FormMessage>
			)}
		</div>
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
