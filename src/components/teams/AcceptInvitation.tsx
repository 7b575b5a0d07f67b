import { useState } from 'react';
import { ApiError, postJson } from '@/lib/client/api-client';
import { Button, FormMessage } from '../ui/Field';

export function AcceptInvitation({ token, teamName }: { token: string; teamName: string }) {
	const [busy, setBusy] = useState(false);
	const [error, setError] = useState<string | null>(null);
	async function accept() {
		setBusy(true);
		setError(null);
		try {
			const { teamId } = await postJson<{ teamId: string }>(`/api/invitations/${token}/accept`);
			window.location.href = `/teams/${teamId}`;
		} catch (e) {
			setError(e instanceof ApiError ? e.message : 'Could not reach the server.');
			setBusy(false);
		}
	}
	return (
		<div className="flex flex-col gap-3">
			<Button onClick={accept} busy={busy}>
				Join {teamName}
			</Button>
			{error && <FormMessage tone="error">{error}</FormMessage>}
		</div>
	);
}
