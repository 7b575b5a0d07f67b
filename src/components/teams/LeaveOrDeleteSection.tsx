import { useState } from 'react';
import { useDeleteTeam, useMemberAction } from '@/lib/client/queries/teams';
import { Button, Field } from '@/components/ui/Field';
import { ErrorNote } from './ErrorNote';

export function LeaveOrDeleteSection({
	teamId,
	teamName,
	captain,
	myUserId,
}: {
	teamId: string;
	teamName: string;
	captain: boolean;
	myUserId: string;
}) {
	const [confirmName, setConfirmName] = useState('');
	const leave = useMemberAction(teamId);
	const remove = useDeleteTeam(teamId);
	const toTeams = { onSuccess: () => window.location.assign('/teams') };
	const busy = leave.isPending || remove.isPending;
	const error = leave.error ?? remove.error;
	return (
		<section aria-labelledby="danger-heading" className="rounded-md border border-brick/40 p-4">
			<h2 id="danger-heading" className="text-xl font-bold text-brick">
				Leave or delete
			</h2>
			<div className="mt-3 flex flex-col gap-4">
				<div className="flex flex-wrap items-center gap-3">
					<Button
						variant="secondary"
						busy={busy}
						onClick={() =>
							window.confirm(`Leave ${teamName}?`) &&
							leave.mutate({ userId: myUserId, role: null }, toTeams)
						}
					>
						Leave the team
					</Button>
					<span className="text-sm text-ink-soft">
						The last captain cannot leave; make someone else captain first.
					</span>
				</div>
				{captain && (
					<form
						className="flex flex-wrap items-end gap-3"
						onSubmit={(e) => {
							e.preventDefault();
							remove.mutate(confirmName, toTeams);
						}}
					>
						<Field
							label={`Type “${teamName}” to delete the team and all its data`}
							value={confirmName}
							onChange={(e) => setConfirmName(e.target.value)}
							className="min-w-72"
						/>
						<Button
							type="submit"
							variant="danger"
							busy={busy}
							disabled={confirmName.trim() !== teamName}
						>
							Delete the team
						</Button>
					</form>
				)}
				<ErrorNote error={error} />
			</div>
		</section>
	);
}
