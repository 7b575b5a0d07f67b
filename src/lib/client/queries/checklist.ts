import { queryOptions, useMutation } from '@tanstack/react-query';
import type { Checklist } from '@/lib/schemas/checklist';
import type { CheckItemDto } from '@/lib/schemas/teams';
import { api, getJson } from '@/lib/client/api-client';

export const checklistKeys = {
	all: ['checklists'] as const,
	sheet: (eventId: string, vehicleId: string) =>
		[...checklistKeys.all, eventId, vehicleId] as const,
};

/** A vehicle's checklist for an event (fetched again when the connection comes back). */
export const checklistQueryOptions = (teamId: string, eventId: string, vehicleId: string) =>
	queryOptions({
		queryKey: checklistKeys.sheet(eventId, vehicleId),
		queryFn: ({ signal }) =>
			getJson<Checklist>(`/api/teams/${teamId}/events/${eventId}/checks?vehicleId=${vehicleId}`, {
				signal,
			}),
	});

export interface SignOffInput {
	vehicleId: string;
	itemKey: string;
	signed: boolean;
	note?: string;
	/** What the member saw: a sheet that changed since then answers 409 with the current one. */
	seen?: { revisionId: string | null; status: 'pass' | 'fail' | 'open' };
}

/** Signs an item off (or withdraws the sign-off); answers the whole checklist as it now is. */
export function useSignOff(teamId: string, eventId: string) {
	return useMutation({
		mutationFn: (input: SignOffInput) =>
			api<Checklist>(`/api/teams/${teamId}/events/${eventId}/checks`, { json: input }),
	});
}

export function useAddCheckItem(teamId: string) {
	return useMutation({
		mutationFn: (label: string) =>
			api<CheckItemDto>(`/api/teams/${teamId}/check-items`, { json: { label } }),
	});
}
