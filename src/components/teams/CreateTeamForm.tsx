import { useState } from 'react';
import { useTypedState } from '@/lib/client/typed-before-hydration';
import { newTeamSchema } from '@/lib/schemas/account';
import { ApiError } from '@/lib/client/api-client';
import { useCreateTeam } from '@/lib/client/queries/teams';
import { withQueryClient } from '@/lib/client/query-client';
import { fieldErrors } from '@/lib/client/form-errors';
import { Button, Field } from '@/components/ui/Field';

export const CreateTeamForm = withQueryClient(function CreateTeamForm() {
	const create = useCreateTeam();
	const [name, setName] = useTypedState('Create a team', 'name', '');
	const [error, setError] = useState<string | undefined>();
	async function submit(event: React.FormEvent) {
		event.preventDefault();
		const parsed = newTeamSchema.safeParse({ name });
		if (!parsed.success) return setError(fieldErrors(parsed.error).name);
		try {
			const team = await create.mutateAsync(parsed.data);
			window.location.href = `/teams/${team.id}`;
		} catch (e) {
			setError(
				e instanceof ApiError ? (e.byField().name ?? e.message) : 'Could not reach the server.',
			);
		}
	}
	return (
		<form
			onSubmit={submit}
			noValidate
			className="flex flex-wrap items-end gap-3"
			aria-label="Create a team"
		>
			<Field
				label="New team name"
				name="name"
				value={name}
				onChange={(e) => setName(e.target.value)}
				error={error}
				className="min-w-64"
			/>
			<Button type="submit" busy={create.isPending || create.isSuccess}>
				Create the team
			</Button>
		</form>
	);
});
