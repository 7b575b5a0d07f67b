import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { BuildDocument, ComparisonColumn } from '@/engine/browser';
import type { PlanDto, PlanSummary, UpdatePlanInput } from '@/lib/schemas/plans';
import type { RevisionDto } from '@/lib/schemas/vehicles';
import { api, getJson } from '@/lib/client/api-client';
import { buildKeys } from './builds';

export type { PlanDto, PlanSummary, ComparisonColumn };

export interface ComparisonDto {
	currency: string;
	head: { id: string; number: number; message: string };
	columns: ComparisonColumn[];
}

export const planKeys = {
	all: ['plans'] as const,
	list: (vehicleId: string) => [...planKeys.all, vehicleId, 'list'] as const,
	compare: (vehicleId: string, ids: string[], rpm: number) =>
		[...planKeys.all, vehicleId, 'compare', ids.join(','), rpm] as const,
};

export const plansQueryOptions = (teamId: string, vehicleId: string) =>
	queryOptions({
		queryKey: planKeys.list(vehicleId),
		queryFn: ({ signal }) =>
			getJson<PlanSummary[]>(`/api/teams/${teamId}/vehicles/${vehicleId}/plans`, { signal }),
	});

export const compareQueryOptions = (
	teamId: string,
	vehicleId: string,
	ids: string[],
	engineRpm: number,
) =>
	queryOptions({
		queryKey: planKeys.compare(vehicleId, ids, engineRpm),
		queryFn: ({ signal }) =>
			getJson<ComparisonDto>(
				`/api/teams/${teamId}/vehicles/${vehicleId}/plans/compare?plans=${ids.join(',')}&engineRpm=${engineRpm}`,
				{ signal },
			),
		enabled: ids.length > 0,
	});

export function useCreatePlan(teamId: string, vehicleId: string) {
	return useMutation({
		mutationFn: (input: {
			name: string;
			fromRevisionId?: string;
			document?: BuildDocument;
			notes?: string;
		}) => api<PlanDto>(`/api/teams/${teamId}/vehicles/${vehicleId}/plans`, { json: input }),
	});
}

/** Saves a plan on top of `version`; a 409 means someone saved it meanwhile (see `fetchPlan`). */
export function useSavePlan(teamId: string, vehicleId: string, planId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (input: UpdatePlanInput) =>
			api<PlanDto>(`/api/teams/${teamId}/vehicles/${vehicleId}/plans/${planId}`, {
				method: 'PUT',
				json: input,
			}),
		onSuccess: () => qc.invalidateQueries({ queryKey: planKeys.all }),
	});
}

export const fetchPlan = (teamId: string, vehicleId: string, planId: string) =>
	api<PlanDto>(`/api/teams/${teamId}/vehicles/${vehicleId}/plans/${planId}`);

export function useInstallPlan(teamId: string, vehicleId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: ({
			planId,
			parentId,
			acceptDangers = [],
			recordPurchasesIn = null,
		}: {
			planId: string;
			parentId: string | null;
			/** Keys of the danger findings the installer was shown and accepts. */
			acceptDangers?: string[];
			/** A season to record the plan's parts in as purchases, paid by the installer. */
			recordPurchasesIn?: string | null;
		}) =>
			api<RevisionDto>(`/api/teams/${teamId}/vehicles/${vehicleId}/plans/${planId}/install`, {
				json: { parentId, acceptDangers, recordPurchasesIn },
			}),
		onSuccess: () =>
			Promise.all([
				qc.invalidateQueries({ queryKey: planKeys.all }),
				qc.invalidateQueries({ queryKey: buildKeys.revisions(vehicleId) }),
			]),
	});
}

export function useDeletePlan(teamId: string, vehicleId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (planId: string) =>
			api(`/api/teams/${teamId}/vehicles/${vehicleId}/plans/${planId}`, { method: 'DELETE' }),
		onSuccess: () => qc.invalidateQueries({ queryKey: planKeys.all }),
	});
}
