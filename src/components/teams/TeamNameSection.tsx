import { useState } from 'react';
import { teamNameSchema } from '@/lib/schemas/account';
import { ApiError } from '@/lib/client/api-client';
import { useUpdateTeam } from '@/lib/client/queries/teams';
import { Button, Field } from '@/components/ui/Field';

export function TeamNameSection({ teamId, teamName }: { teamId: string; teamName: string }) {
	const [name, setName] = useState(teamName);
	const [error, setError] = useState<string | undefined>();
	const update = useUpdateTeam(teamId);
	function submit(event: React.FormEvent) {
		event.preventDefault();
		const parsed = teamNameSchema.safeParse(name);
		if (!parsed.success) return setError(parsed.error.issues[0]!.message);
		setError(undefined);
		update.mutate(
			{ name: parsed.data },
			{ onError: (e) => setError(e instanceof ApiError ? e.message : 'Could not save') },
		);
	}
	return (
		<section aria-labelledby="name-heading">
			<h2 id="name-heading" className="text-xl font-bold">
				Team name
			</h2>
			<form onSubmit={submit} noValidate className="mt-3 flex flex-wrap items-end gap-3">
				<Field
					label="Name"
					value={name}
					onChange={(e) => {
						setName(e.target.value);
						update.reset();
					}}
					error={error}
					className="min-w-64"
				/>
				<Button type="submit" variant="secondary" busy={update.isPending}>
					Rename
				</Button>
				{update.isSuccess && (
					<span role="status" className="text-sm text-teal">
						✓ Saved
					</span>
				)}
			</form>
		</section>
	);
}
