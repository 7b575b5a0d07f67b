import { useState } from 'react';
import { FormMessage } from '@/components/ui/Field';
import { ApiError } from '@/lib/client/api-client';
import { useUpdateTeam } from '@/lib/client/queries/teams';

/** Whether viewers (a sponsor, an advising shop) may write in the team's threads; off by default. */
export function ViewerCommentSection({ teamId, initial }: { teamId: string; initial: boolean }) {
	const [on, setOn] = useState(initial);
	const update = useUpdateTeam(teamId);
	return (
		<section aria-labelledby="viewer-comments-heading">
			<h2 id="viewer-comments-heading" className="text-xl font-bold">
				Comments from viewers
			</h2>
			<p className="text-sm text-ink-soft">
				Viewers always read the discussions beside revisions, runs, plans and events. Members and
				captains write in them; allow viewers too if the team wants their word.
			</p>
			<label className="mt-3 flex items-center gap-2">
				<input
					type="checkbox"
					checked={on}
					disabled={update.isPending}
					onChange={(e) => {
						const next = e.target.checked;
						update.mutate({ viewersMayComment: next }, { onSuccess: () => setOn(next) });
					}}
				/>
				<span>Viewers may comment</span>
			</label>
			{update.isError && (
				<FormMessage tone="error">
					{update.error instanceof ApiError ? update.error.message : 'Could not save'}
				</FormMessage>
			)}
			{update.isSuccess && (
				<FormMessage tone="ok">
					{on ? 'Viewers may now comment.' : 'Only members and captains comment now.'}
				</FormMessage>
			)}
		</section>
	);
}
