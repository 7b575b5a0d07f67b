import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from '@/lib/zod';
import type { BuildDocument } from '@/engine/browser';
import type {
	newVehicleSchema,
	RevisionDto,
	RevisionSummary,
	VehicleDto,
} from '@/lib/schemas/vehicles';
import { api, getJson } from '@/lib/client/api-client';

type NewVehicleInput = z.input<typeof newVehicleSchema>;

export type { RevisionDto, RevisionSummary };

export const buildKeys = {
	all: ['builds'] as const,
	revisions: (vehicleId: string) => [...buildKeys.all, vehicleId, 'revisions'] as const,
};

export const revisionsQueryOptions = (teamId: string, vehicleId: string) =>
	queryOptions({
		queryKey: buildKeys.revisions(vehicleId),
		queryFn: ({ signal }) =>
			getJson<RevisionSummary[]>(`/api/teams/${teamId}/vehicles/${vehicleId}/revisions`, {
				signal,
			}),
	});

export const vehicleKeys = {
	all: ['vehicles'] as const,
	detail: (vehicleId: string) => [...vehicleKeys.all, vehicleId] as const,
};

/** Saves a draft as a new revision; a 409 means someone saved first (see `fetchHeadRevision`). */
export function useSaveRevision(teamId: string, vehicleId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (input: { parentId: string | null; message: string; document: BuildDocument }) =>
			api<RevisionDto>(`/api/teams/${teamId}/vehicles/${vehicleId}/revisions`, { json: input }),
		onSuccess: () => qc.invalidateQueries({ queryKey: buildKeys.revisions(vehicleId) }),
	});
}

/** The build's current head revision, read fresh (after a conflict). */
export async function fetchHeadRevision(
	teamId: string,
	vehicleId: string,
): Promise<RevisionDto | null> {
	const vehicle = await api<VehicleDto>(`/api/teams/${teamId}/vehicles/${vehicleId}`);
	return vehicle.headRevisionId
		? api<RevisionDto>(
				`/api/teams/${teamId}/vehicles/${vehicleId}/revisions/${vehicle.headRevisionId}`,
			)
		: null;
}

export function useRestoreRevision(teamId: string, vehicleId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: ({ revisionId, parentId }: { revisionId: string; parentId: string | null }) =>
			api<RevisionDto>(
				`/api/teams/${teamId}/vehicles/${vehicleId}/revisions/${revisionId}/restore`,
				{ json: { parentId } },
			),
		onSuccess: () => qc.invalidateQueries({ queryKey: buildKeys.revisions(vehicleId) }),
	});
}

export function useCreateVehicle(teamId: string) {
	return useMutation({
		mutationFn: (input: NewVehicleInput) =>
			api<VehicleDto>(`/api/teams/${teamId}/vehicles`, { json: input }),
	});
}

export function useUpdateVehicle(teamId: string, vehicleId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (changes: Partial<NewVehicleInput> & { archived?: boolean }) =>
			api<VehicleDto>(`/api/teams/${teamId}/vehicles/${vehicleId}`, {
				method: 'PATCH',
				json: changes,
			}),
		onSuccess: () => qc.invalidateQueries({ queryKey: vehicleKeys.detail(vehicleId) }),
	});
}
