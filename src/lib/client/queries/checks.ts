import { useMutation } from '@tanstack/react-query';
import type { Checklist } from '@/lib/schemas/checks';
import type { CheckItemDto } from '@/lib/schemas/teams';
import { api } from '@/lib/client/api-client';

/** Signs an item off (or withdraws the sign-off); answers the whole checklist as it now is. */
export function useSignOff(teamId: string, eventId: string) {
	return useMutation({
		mutationFn: (input: { vehicleId: string; itemKey: string; signed: boolean; note?: string }) => api<Checklist>(`/api/teams/${teamId}/events/${eventId}/checks`, { json: input }),
	});
}

export function useAddCheckItem(teamId: string) {
	return useMutation({ mutationFn: (label: string) => api<CheckItemDto>(`/api/teams/${teamId}/check-items`, { json: { label } }) });
}

export function useCreateEvent(teamId: string) {
	return useMutation({
		mutationFn: (input: { name: string; startsOn: string; endsOn: string; place: string; format: string; notes: string }) => api<{ id: string }>(`/api/teams/${teamId}/events`, { json: input }),
	});
}
