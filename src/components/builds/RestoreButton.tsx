import { useState } from 'react';
import { ApiError, postJson } from '@/lib/client/api-client';

export function RestoreButton({ teamId, vehicleId, revisionId, number, headId }: { teamId: string; vehicleId: string; revisionId: string; number: number; headId: string | null }) {
	const [busy, setBusy] = useState(false);
	const [error, setError] = useState<string | null>(null);
	return (
		<span className="flex items-center gap-2">
			<button
				type="button"
				disabled={busy}
				onClick={async () => {
					if (!window.confirm(`Make revision ${number} the current build again? It is added as a new revision.`)) return;
					setBusy(true);
					try {
						await postJson(`/api/teams/${teamId}/vehicles/${vehicleId}/revisions/${revisionId}/restore`, { parentId: headId });
						window.location.reload();
					} catch (e) {
						setError(e instanceof ApiError ? e.message : 'Could not reach the server');
						setBusy(false);
					}
				}}
				className="rounded-md border border-hairline px-2 py-0.5 text-xs font-semibold hover:border-copper"
			>
				{busy ? 'Restoring…' : 'Restore'}
			</button>
			{error && <span role="alert" className="text-xs text-brick">{error}</span>}
		</span>
	);
}
