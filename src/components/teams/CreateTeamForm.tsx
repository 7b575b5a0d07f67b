import { useState } from 'react';
import { newTeamSchema } from '@/lib/schemas/account';
import { ApiError, postJson } from '@/lib/client/api-client';
import { fieldErrors } from '@/lib/client/form-errors';
import { Button, Field } from '../ui/Field';

export function CreateTeamForm() {
	const [name, setName] = useState('');
	const [error, setError] = useState<string | undefined>();
	const [busy, setBusy] = useState(false);
	async function submit(event: React.FormEvent) {
		event.preventDefault();
		const parsed = newTeamSchema.safeParse({ name });
		if (!parsed.success) return setError(fieldErrors(parsed.error).name);
		setBusy(true);
		try {
			const team = await postJson<{ id: string }>('/api/teams', parsed.data);
			window.location.href = `/teams/${team.id}`;
		} catch (e) {
			setError(e instanceof ApiError ? (e.byField().name ?? e.message) : 'Could not reach the server.');
			setBusy(false);
		}
	}
	return (
		<form onSubmit={submit} noValidate className="flex flex-wrap items-end gap-3" aria-label="Create a team">
			<Field label="New team name" value={name} onChange={(e) => setName(e.target.value)} error={error} className="min-w-64" />
			<Button type="submit" busy={busy}>
				Create the team
			</Button>
		</form>
	);
}
