import { queryOptions } from '@tanstack/react-query';
import type { ComparisonColumn } from '@/engine/compare';
import type { PlanDto, PlanSummary } from '@/lib/server/db/plans';
import { getJson } from '../api-client';

export type { PlanDto, PlanSummary, ComparisonColumn };

export interface ComparisonDto {
	currency: string;
	head: { id: string; number: number; message: string };
	columns: ComparisonColumn[];
}

export const planKeys = {
	all: ['plans'] as const,
	list: (vehicleId: string) => [...planKeys.all, vehicleId, 'list'] as const,
	compare: (vehicleId: string, ids: string[], rpm: number) => [...planKeys.all, vehicleId, 'compare', ids.join(','), rpm] as const,
};

export const plansQueryOptions = (teamId: string, vehicleId: string) =>
	queryOptions({
		queryKey: planKeys.list(vehicleId),
		queryFn: ({ signal }) => getJson<PlanSummary[]>(`/api/teams/${teamId}/vehicles/${vehicleId}/plans`, { signal }),
	});

export const compareQueryOptions = (teamId: string, vehicleId: string, ids: string[], engineRpm: number) =>
	queryOptions({
		queryKey: planKeys.compare(vehicleId, ids, engineRpm),
		queryFn: ({ signal }) => getJson<ComparisonDto>(`/api/teams/${teamId}/vehicles/${vehicleId}/plans/compare?plans=${ids.join(',')}&engineRpm=${engineRpm}`, { signal }),
		enabled: ids.length > 0,
	});
