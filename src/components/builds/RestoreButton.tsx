import { ApiError } from '@/lib/client/api-client';
import { useRestoreRevision } from '@/lib/client/queries/builds';
import { withQueryClient } from '@/lib/client/query-client';

export const RestoreButton = withQueryClient(function RestoreButton({
	teamId,
	vehicleId,
	revisionId,
	number,
	headId,
}: {
	teamId: string;
	vehicleId: string;
	revisionId: string;
	number: number;
	headId: string | null;
}) {
	const restore = useRestoreRevision(teamId, vehicleId);
	const busy = restore.isPending || restore.isSuccess;
	return (
		<span className="flex items-center gap-2">
			<button
				type="button"
				disabled={busy}
				onClick={() => {
					if (
						!window.confirm(
							`Make revision ${number} the current build again? It is added as a new revision.`,
						)
					)
						return;
					restore.mutate(
						{ revisionId, parentId: headId },
						{ onSuccess: () => window.location.reload() },
					);
				}}
				className="rounded-md border border-hairline px-2 py-0.5 text-xs font-semibold hover:border-copper"
			>
				{busy ? 'Restoring…' : 'Restore'}
			</button>
			{restore.isError && (
				<span role="alert" className="text-xs text-brick">
					{restore.error instanceof ApiError ? restore.error.message : 'Could not reach the server'}
				</span>
			)}
		</span>
	);
});
