import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api, getJson } from '@/lib/client/api-client';
import type { ShelfItemInput } from '@/lib/schemas/shelf';
import type { ShelfItemDto } from '@/lib/shelf-kinds';

export const shelfKeys = {
	all: ['shelf'] as const,
	team: (teamId: string) => [...shelfKeys.all, teamId] as const,
};

/** The team's shelf as it is now. */
export const fetchShelf = (teamId: string, signal?: AbortSignal) =>
	getJson<ShelfItemDto[]>(`/api/teams/${teamId}/shelf`, { signal });

export const shelfQueryOptions = (teamId: string) =>
	queryOptions({
		queryKey: shelfKeys.team(teamId),
		queryFn: ({ signal }) => fetchShelf(teamId, signal),
		staleTime: 30_000,
	});

/** Adds an entry (no id) or replaces one read at `updatedAt` (a newer save answers 409 with it). */
export function useSaveShelfItem(teamId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (input: { id?: string; updatedAt?: string; item: ShelfItemInput }) =>
			input.id
				? api<ShelfItemDto>(`/api/teams/${teamId}/shelf/${input.id}`, {
						method: 'PUT',
						json: { item: input.item, updatedAt: input.updatedAt },
					})
				: api<ShelfItemDto>(`/api/teams/${teamId}/shelf`, { json: input.item }),
		onSettled: () => qc.invalidateQueries({ queryKey: shelfKeys.team(teamId) }),
	});
}

export function useRemoveShelfItem(teamId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (id: string) => api(`/api/teams/${teamId}/shelf/${id}`, { method: 'DELETE' }),
		onSettled: () => qc.invalidateQueries({ queryKey: shelfKeys.team(teamId) }),
	});
}

/** Sends a shelf CSV as it is; the answer names each refused row and column. */
export function useImportShelf(teamId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: async (file: File) => {
			const res = await fetch(`/api/teams/${teamId}/shelf/import`, {
				method: 'POST',
				headers: { 'content-type': 'text/csv', accept: 'application/json' },
				body: await file.text(),
			});
			return {
				ok: res.ok,
				body: (await res.json()) as {
					added?: number;
					detail?: string;
					errors?: Array<{ message: string }>;
				},
			};
		},
		onSettled: () => qc.invalidateQueries({ queryKey: shelfKeys.team(teamId) }),
	});
}
