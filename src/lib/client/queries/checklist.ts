import { useMutation } from '@tanstack/react-query';
import type { Checklist } from '@/lib/schemas/checklist';
import type { CheckItemDto } from '@/lib/schemas/teams';
import { api } from '@/lib/client/api-client';

/** Signs an item off (or withdraws the sign-off); answers the whole checklist as it now is. */
export function useSignOff(teamId: string, eventId: string) {
	return useMutation({
		mutationFn: (input: {
			vehicleId: string;
			itemKey: string;
			signed: boolean;
			note?: string;
			/** What the member saw: a sheet that changed since then answers 409 with the current one. */
			seen?: { revisionId: string | null; status: 'pass' | 'fail' | 'open' };
		}) => api<Checklist>(`/api/teams/${teamId}/events/${eventId}/checks`, { json: input }),
	});
}

export function useAddCheckItem(teamId: string) {
	return useMutation({
		mutationFn: (label: string) =>
			api<CheckItemDto>(`/api/teams/${teamId}/check-items`, { json: { label } }),
	});
}
