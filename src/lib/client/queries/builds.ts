import { queryOptions } from '@tanstack/react-query';
import type { RevisionDto, RevisionSummary } from '@/lib/server/db/builds';
import { getJson } from '../api-client';

export type { RevisionDto, RevisionSummary };

export const buildKeys = {
	all: ['builds'] as const,
	revisions: (vehicleId: string) => [...buildKeys.all, vehicleId, 'revisions'] as const,
};

export const revisionsQueryOptions = (teamId: string, vehicleId: string) =>
	queryOptions({
		queryKey: buildKeys.revisions(vehicleId),
		queryFn: ({ signal }) => getJson<RevisionSummary[]>(`/api/teams/${teamId}/vehicles/${vehicleId}/revisions`, { signal }),
	});
