import { useQuery } from '@tanstack/react-query';
import { invitationsQueryOptions, useInvitationAction } from '@/lib/client/queries/teams';
import { Button } from '@/components/ui/Field';
import { ErrorNote } from './ErrorNote';
import { RelativeTime } from '@/components/ui/RelativeTime';

export function PendingSection({ teamId }: { teamId: string }) {
	const pending = useQuery(invitationsQueryOptions(teamId));
	const action = useInvitationAction(teamId);
	return (
		<section aria-labelledby="pending-heading">
			<h2 id="pending-heading" className="text-xl font-bold">
				Pending invitations
			</h2>
			{pending.isPending && (
				<p className="mt-3 text-sm text-ink-soft" role="status">
					Loading invitations…
				</p>
			)}
			{pending.isError && (
				<div className="mt-3">
					<ErrorNote error={pending.error} />
				</div>
			)}
			{pending.data && pending.data.length === 0 && (
				<p className="mt-3 text-sm text-ink-soft">No invitations waiting for an answer.</p>
			)}
			{pending.data && pending.data.length > 0 && (
				<ul className="mt-3 divide-y divide-hairline rounded-md border border-hairline bg-card">
					{pending.data.map((inv) => (
						<li key={inv.id} className="flex flex-wrap items-center gap-3 px-4 py-3 text-sm">
							<span className="font-semibold">{inv.email}</span>
							<span className="rounded bg-paper px-2 py-0.5 capitalize">{inv.role}</span>
							<span className={inv.expired ? 'text-amber-text' : 'text-ink-soft'}>
								{inv.expired ? (
									'⏱ expired'
								) : (
									<>
										expires <RelativeTime at={inv.expiresAt} />
									</>
								)}
							</span>
							<span className="flex-1" />
							<Button
								variant="secondary"
								className="px-2 py-1 text-xs"
								busy={
									action.isPending &&
									action.variables?.id === inv.id &&
									action.variables.action === 'resend'
								}
								onClick={() => action.mutate({ id: inv.id, action: 'resend' })}
							>
								Send again
							</Button>
							<Button
								variant="secondary"
								className="px-2 py-1 text-xs"
								onClick={() => action.mutate({ id: inv.id, action: 'revoke' })}
							>
								Withdraw
							</Button>
						</li>
					))}
				</ul>
			)}
			<div className="mt-2">
				<ErrorNote error={action.error} />
			</div>
		</section>
	);
}
