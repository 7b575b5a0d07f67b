import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/client/api-client';

export function useCreateEvent(teamId: string) {
	return useMutation({
		mutationFn: (input: {
			name: string;
			startsOn: string;
			endsOn: string;
			place: string;
			format: string;
			notes: string;
		}) => api<{ id: string }>(`/api/teams/${teamId}/events`, { json: input }),
	});
}
