import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api, getJson } from '@/lib/client/api-client';
import type {
	NewPurchaseInput,
	NewSeasonInput,
	SeasonDetail,
	SeasonDto,
} from '@/lib/schemas/seasons';

export type { SeasonDetail };

export const seasonKeys = {
	all: ['seasons'] as const,
	list: (teamId: string) => [...seasonKeys.all, teamId, 'list'] as const,
	detail: (teamId: string, seasonId: string) => [...seasonKeys.all, teamId, seasonId] as const,
};

export const seasonsQueryOptions = (teamId: string) =>
	queryOptions({
		queryKey: seasonKeys.list(teamId),
		queryFn: ({ signal }) => getJson<SeasonDto[]>(`/api/teams/${teamId}/seasons`, { signal }),
	});

export const seasonQueryOptions = (teamId: string, seasonId: string) =>
	queryOptions({
		queryKey: seasonKeys.detail(teamId, seasonId),
		queryFn: ({ signal }) =>
			getJson<SeasonDetail>(`/api/teams/${teamId}/seasons/${seasonId}`, { signal }),
	});

export function useCreateSeason(teamId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (input: NewSeasonInput) =>
			api<SeasonDto>(`/api/teams/${teamId}/seasons`, { json: input }),
		onSettled: () => qc.invalidateQueries({ queryKey: seasonKeys.list(teamId) }),
	});
}

export function useAddPurchase(teamId: string, seasonId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (input: Omit<NewPurchaseInput, 'notes'> & { notes?: string }) =>
			api<{ id: string }>(`/api/teams/${teamId}/seasons/${seasonId}/purchases`, { json: input }),
		onSettled: () => qc.invalidateQueries({ queryKey: seasonKeys.all }),
	});
}

export function useRemovePurchase(teamId: string, seasonId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (id: string) =>
			api(`/api/teams/${teamId}/seasons/${seasonId}/purchases/${id}`, { method: 'DELETE' }),
		onSettled: () => qc.invalidateQueries({ queryKey: seasonKeys.all }),
	});
}

/** Adds or replaces a purchase's receipt photo (checked and stripped of metadata by the server). */
export function useUploadReceipt(teamId: string, seasonId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (input: { purchaseId: string; file: File }) => {
			const form = new FormData();
			form.set('file', input.file);
			return api<{ fileId: string; metadataRemoved: boolean }>(
				`/api/teams/${teamId}/seasons/${seasonId}/purchases/${input.purchaseId}/receipt`,
				{ form },
			);
		},
		onSettled: () => qc.invalidateQueries({ queryKey: seasonKeys.detail(teamId, seasonId) }),
	});
}

export function useRemoveReceipt(teamId: string, seasonId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (purchaseId: string) =>
			api(`/api/teams/${teamId}/seasons/${seasonId}/purchases/${purchaseId}/receipt`, {
				method: 'DELETE',
			}),
		onSettled: () => qc.invalidateQueries({ queryKey: seasonKeys.detail(teamId, seasonId) }),
	});
}
