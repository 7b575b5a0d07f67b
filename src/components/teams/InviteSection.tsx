import { useState } from 'react';
import { newInvitationSchema } from '@/lib/schemas/account';
import { ApiError } from '@/lib/client/api-client';
import { fieldErrors } from '@/lib/client/form-errors';
import { type Role, useInvite } from '@/lib/client/queries/teams';
import { Button, Field, FormMessage } from '@/components/ui/Field';
import { ErrorNote } from './ErrorNote';
import { ROLES } from './MembersSection';

export function InviteSection({ teamId }: { teamId: string }) {
	const [email, setEmail] = useState('');
	const [role, setRole] = useState<Role>('member');
	const [errors, setErrors] = useState<Record<string, string>>({});
	const invite = useInvite(teamId);
	const [sentTo, setSentTo] = useState<string | null>(null);

	function submit(event: React.FormEvent) {
		event.preventDefault();
		setSentTo(null);
		const parsed = newInvitationSchema.safeParse({ email, role });
		if (!parsed.success) return setErrors(fieldErrors(parsed.error));
		setErrors({});
		invite.mutate(parsed.data, {
			onSuccess: (inv) => {
				setSentTo(inv.email);
				setEmail('');
			},
			onError: (e) => e instanceof ApiError && setErrors(e.byField()),
		});
	}

	return (
		<section aria-labelledby="invite-heading">
			<h2 id="invite-heading" className="text-xl font-bold">
				Invite someone
			</h2>
			<form
				onSubmit={submit}
				noValidate
				className="mt-3 flex flex-wrap items-end gap-3 rounded-md border border-hairline bg-card p-4"
				aria-label="Invite by e-mail"
			>
				<Field
					label="E-mail"
					type="email"
					name="invite-email"
					value={email}
					onChange={(e) => setEmail(e.target.value)}
					error={errors.email}
					className="min-w-64 flex-1"
				/>
				<div className="flex flex-col gap-1">
					<label htmlFor="invite-role" className="text-sm font-semibold">
						Role
					</label>
					<select
						id="invite-role"
						value={role}
						onChange={(e) => setRole(e.target.value as Role)}
						className="rounded-md border border-hairline bg-card px-3 py-2"
					>
						{ROLES.map((r) => (
							<option key={r} value={r}>
								{r}
							</option>
						))}
					</select>
				</div>
				<Button type="submit" busy={invite.isPending}>
					Send invitation
				</Button>
			</form>
			<div className="mt-2 flex flex-col gap-2">
				{sentTo && (
					<FormMessage tone="ok">
						Invitation sent to {sentTo}. The link works once, for 7 days.
					</FormMessage>
				)}
				{invite.error && !Object.keys(errors).length && <ErrorNote error={invite.error} />}
			</div>
		</section>
	);
}
