import { Button, FormMessage } from '@/components/ui/Field';
import { ApiError } from '@/lib/client/api-client';
import { useAcceptInvitation } from '@/lib/client/queries/teams';
import { withQueryClient } from '@/lib/client/query-client';

export const AcceptInvitation = withQueryClient(function AcceptInvitation({
	token,
	teamName,
}: {
	token: string;
	teamName: string;
}) {
	const accept = useAcceptInvitation(token);
	return (
		<div className="flex flex-col gap-3">
			<Button
				onClick={() =>
					accept.mutate(undefined, {
						onSuccess: ({ teamId }) => window.location.assign(`/teams/${teamId}`),
					})
				}
				busy={accept.isPending || accept.isSuccess}
			>
				Join {teamName}
			</Button>
			{accept.isError && (
				<FormMessage tone="error">
					{accept.error instanceof ApiError ? accept.error.message : 'Could not reach the server.'}
				</FormMessage>
			)}
		</div>
	);
});
