import { useEffect, useState } from 'react';
import { useTypedState } from '@/lib/client/typed-before-hydration';
import { useImportTeam } from '@/lib/client/queries/teams';
import { withQueryClient } from '@/lib/client/query-client';
import type { ImportSummary } from '@/lib/schemas/teams';
import { Button, Field, FormMessage } from '@/components/ui/Field';

/** Restores a team backup file as a new team, with upload progress and the server's reason when it refuses. */
const count = (n: number, noun: string) => `${n} ${noun}${n === 1 ? '' : 's'}`;

export const ImportTeamForm = withQueryClient(function ImportTeamForm() {
	const importTeam = useImportTeam();
	// A file or a name given before the island woke (client:interact) is kept: the name from the
	// first render, the file once hydrated (a state the server did not render must not be hydrated).
	const [file, setFile] = useState<File | null>(null);
	useEffect(() => {
		const chosen = document.querySelector<HTMLInputElement>('#backup-file')?.files?.[0];
		if (chosen) setFile(chosen);
	}, []);
	const [name, setName] = useTypedState('Restore a team from a backup', 'name', '');
	const [progress, setProgress] = useState<number | null>(null);
	const [error, setError] = useState<string | null>(null);
	const [done, setDone] = useState<ImportSummary | null>(null);

	return (
		<form
			aria-label="Restore a team from a backup"
			className="flex flex-col gap-3"
			onSubmit={async (e) => {
				e.preventDefault();
				if (!file) return setError('Choose the backup file first.');
				setError(null);
				setDone(null);
				setProgress(0);
				try {
					setDone(await importTeam.mutateAsync({ file, name, onProgress: setProgress }));
				} catch (err) {
					setError(err instanceof Error ? err.message : 'The import failed.');
				} finally {
					setProgress(null);
				}
			}}
		>
			<div className="flex flex-wrap items-end gap-3">
				<div className="flex flex-col gap-1">
					<label htmlFor="backup-file" className="text-sm font-semibold">
						Backup file
					</label>
					<input
						id="backup-file"
						type="file"
						accept="application/json,.json"
						onChange={(e) => setFile(e.target.files?.[0] ?? null)}
						className="rounded-md border border-hairline bg-card px-3 py-1.5 text-sm"
					/>
				</div>
				<Field
					label="Name for the restored team (optional)"
					name="name"
					value={name}
					onChange={(e) => setName(e.target.value)}
					maxLength={80}
					className="min-w-64"
				/>
				<Button type="submit" variant="secondary" busy={progress !== null} disabled={!file}>
					Restore as a new team
				</Button>
			</div>
			{progress !== null && (
				<div
					role="progressbar"
					aria-label="Uploading the backup"
					aria-valuenow={progress}
					aria-valuemin={0}
					aria-valuemax={100}
					className="h-2 w-full max-w-md overflow-hidden rounded bg-paper"
				>
					<div className="h-full bg-copper-deep transition-all" style={{ width: `${progress}%` }} />
				</div>
			)}
			{progress === 100 && (
				<p role="status" className="text-sm text-ink-soft">
					Checking and writing the team…
				</p>
			)}
			{error && <FormMessage tone="error">{error}</FormMessage>}
			{done && (
				<FormMessage tone="ok">
					“{done.name}” is restored: {count(done.vehicles, 'vehicle')},{' '}
					{count(done.revisions, 'revision')}, {count(done.plans, 'plan')},{' '}
					{count(done.events, 'event')}, {count(done.runs, 'run')}, {count(done.files, 'file')}. You
					are its captain
					{done.invitations > 0 &&
						`; the ${done.invitations} other ${done.invitations === 1 ? 'person' : 'people'} in the file ${done.invitations === 1 ? 'has' : 'have'} a pending invitation (send it from the team page; each joins by accepting it)`}
					. Authors and sign-offs show as recorded in the file.{' '}
					<a className="font-semibold underline" href={`/teams/${done.teamId}`}>
						Open the team
					</a>
				</FormMessage>
			)}
		</form>
	);
});
