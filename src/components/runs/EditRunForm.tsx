import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Button, Field, FormMessage } from '@/components/ui/Field';
import { ApiError } from '@/lib/client/api-client';
import { revisionsQueryOptions } from '@/lib/client/queries/builds';
import { type RunDto, useUpdateRun } from '@/lib/client/queries/runs';
import { measurementsFromTexts, measurementTexts } from '@/lib/schemas/run-measurements';
import { MeasurementFields } from './MeasurementFields';

/** Edits a logged run: every measurement, the notes and the revision it was made on. */
export function EditRunForm({
	teamId,
	vehicleId,
	run,
}: {
	teamId: string;
	vehicleId: string;
	run: RunDto;
}) {
	const [open, setOpen] = useState(false);
	const revisions = useQuery({ ...revisionsQueryOptions(teamId, vehicleId), enabled: open });
	const update = useUpdateRun(teamId, run.id);
	const [numbers, setNumbers] = useState(() => measurementTexts(run));
	const [notes, setNotes] = useState(run.notes);
	const [revisionId, setRevisionId] = useState(run.revisionId ?? '');
	if (!open)
		return (
			<Button variant="secondary" className="mt-4" onClick={() => setOpen(true)}>
				Edit this run
			</Button>
		);
	const error = update.error instanceof ApiError ? update.error : null;
	const errors = error?.byField() ?? {};
	return (
		<form
			noValidate
			aria-label="Edit the run"
			className="mt-4 flex flex-wrap items-end gap-3 rounded-md border border-hairline p-3"
			onSubmit={(e) => {
				e.preventDefault();
				update.mutate(
					{ ...measurementsFromTexts(numbers), notes, revisionId: revisionId || null },
					{ onSuccess: () => setOpen(false) },
				);
			}}
		>
			<MeasurementFields
				values={numbers}
				errors={errors}
				onChange={(f, v) => setNumbers((n) => ({ ...n, [f]: v }))}
				className="w-40"
			/>
			<div className="flex flex-col gap-1">
				<label htmlFor={`rev-${run.id}`} className="text-sm font-semibold">
					Revision in force
				</label>
				<select
					id={`rev-${run.id}`}
					value={revisionId}
					onChange={(e) => setRevisionId(e.target.value)}
					className="rounded-md border border-hairline bg-card px-3 py-2"
				>
					<option value="">none</option>
					{revisions.data?.map((r) => (
						<option key={r.id} value={r.id}>
							r{r.number} · {r.message.slice(0, 40)}
						</option>
					))}
					{!revisions.data && run.revisionId && (
						<option value={run.revisionId}>r{run.revisionNumber}</option>
					)}
				</select>
			</div>
			<Field
				label="Notes"
				value={notes}
				onChange={(e) => setNotes(e.target.value)}
				error={errors.notes}
				className="min-w-64 flex-1"
			/>
			<Button type="submit" busy={update.isPending}>
				Save
			</Button>
			<Button type="button" variant="secondary" onClick={() => setOpen(false)}>
				Cancel
			</Button>
			{update.isError && (
				<FormMessage tone="error">{error?.message ?? 'Could not save'}</FormMessage>
			)}
		</form>
	);
}
