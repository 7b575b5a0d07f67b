import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { RunAnalysis, Sample } from '@/engine/browser';
import type { EventDto } from '@/lib/schemas/events';
import type { z } from '@/lib/zod';
import type { newRunSchema, RunDto, RunPhoto, updateRunSchema } from '@/lib/schemas/runs';
import type { RevisionDto } from '@/lib/schemas/vehicles';
import { api, getJson } from '@/lib/client/api-client';

export type { EventDto, RunDto, RunPhoto };

export interface RunDetail {
	run: RunDto;
	samples: Sample[];
	analysis: RunAnalysis | null;
}

export const runKeys = {
	all: ['runs'] as const,
	byVehicle: (vehicleId: string) => [...runKeys.all, 'vehicle', vehicleId] as const,
	byTeam: (teamId: string) => [...runKeys.all, 'team', teamId] as const,
	detail: (runId: string) => [...runKeys.all, 'detail', runId] as const,
	photos: (runId: string) => [...runKeys.all, 'photos', runId] as const,
	revision: (revisionId: string | null) => [...runKeys.all, 'revision', revisionId] as const,
	diff: (from: string | null, to: string | null) => [...runKeys.all, 'diff', from, to] as const,
};

/** Every run of the team (all vehicles), for comparing runs across vehicles. */
export const teamRunsQueryOptions = (teamId: string) =>
	queryOptions({
		queryKey: runKeys.byTeam(teamId),
		queryFn: ({ signal }) => getJson<RunDto[]>(`/api/teams/${teamId}/runs`, { signal }),
	});

export const vehicleRunsQueryOptions = (teamId: string, vehicleId: string) =>
	queryOptions({
		queryKey: runKeys.byVehicle(vehicleId),
		queryFn: ({ signal }) =>
			getJson<RunDto[]>(`/api/teams/${teamId}/runs?vehicleId=${vehicleId}`, { signal }),
	});

export const runDetailQueryOptions = (teamId: string, runId: string) =>
	queryOptions({
		queryKey: runKeys.detail(runId),
		queryFn: ({ signal }) => getJson<RunDetail>(`/api/teams/${teamId}/runs/${runId}`, { signal }),
	});

export const runPhotosQueryOptions = (teamId: string, runId: string) =>
	queryOptions({
		queryKey: runKeys.photos(runId),
		queryFn: ({ signal }) =>
			getJson<RunPhoto[]>(`/api/teams/${teamId}/runs/${runId}/photos`, { signal }),
	});

/** The revision a run was made on (for the model beside the measurement). */
export const runRevisionQueryOptions = (
	teamId: string,
	vehicleId: string,
	revisionId: string | null,
) =>
	queryOptions({
		queryKey: runKeys.revision(revisionId),
		queryFn: ({ signal }) =>
			getJson<RevisionDto>(`/api/teams/${teamId}/vehicles/${vehicleId}/revisions/${revisionId}`, {
				signal,
			}),
		enabled: Boolean(revisionId),
		staleTime: Infinity,
	});

export interface RevisionChanges {
	changes: Array<{ group: string; label: string; kind: string; fields: Array<{ field: string }> }>;
}

/** What changed between the revisions of two runs (nothing to ask when they are the same). */
export function useRevisionDiff(
	teamId: string,
	vehicleId: string,
	from: string | null,
	to: string | null,
) {
	return useQuery({
		queryKey: runKeys.diff(from, to),
		queryFn: ({ signal }) =>
			getJson<RevisionChanges>(
				`/api/teams/${teamId}/vehicles/${vehicleId}/diff?from=${from}&to=${to}`,
				{ signal },
			),
		enabled: Boolean(from && to && from !== to),
		staleTime: Infinity,
	});
}

export type NewRun = z.input<typeof newRunSchema>;

export function useLogRun(teamId: string, vehicleId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (input: NewRun) => api<RunDto>(`/api/teams/${teamId}/runs`, { json: input }),
		onSettled: () => qc.invalidateQueries({ queryKey: runKeys.byVehicle(vehicleId) }),
	});
}

export function useUpdateRun(teamId: string, runId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (changes: z.input<typeof updateRunSchema>) =>
			api<RunDto>(`/api/teams/${teamId}/runs/${runId}`, { method: 'PATCH', json: changes }),
		onSettled: () => qc.invalidateQueries({ queryKey: runKeys.all }),
	});
}

export function useDeleteRun(teamId: string, vehicleId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (runId: string) => api(`/api/teams/${teamId}/runs/${runId}`, { method: 'DELETE' }),
		onSettled: () => qc.invalidateQueries({ queryKey: runKeys.byVehicle(vehicleId) }),
	});
}

export function useUploadPhoto(teamId: string, runId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (file: File) => {
			const form = new FormData();
			form.set('file', file);
			return api<{ photoId: string; thumbnailId: string; metadataRemoved: boolean }>(
				`/api/teams/${teamId}/runs/${runId}/photos`,
				{ form },
			);
		},
		onSettled: () => qc.invalidateQueries({ queryKey: runKeys.photos(runId) }),
	});
}

export interface LoggerUpload {
	runId: string;
	file: File;
	mapping: { timeColumn: string; voltsColumn: string; ampsColumn: string; timeUnit: string };
	onProgress: (percent: number) => void;
}

export function useUploadLogger(teamId: string, vehicleId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: ({ runId, file, mapping, onProgress }: LoggerUpload) => {
			const form = new FormData();
			form.set('file', file);
			for (const [k, v] of Object.entries(mapping)) form.set(k, v);
			return api<{ samples: number; analysis: RunAnalysis }>(
				`/api/teams/${teamId}/runs/${runId}/logger`,
				{ form, onUploadProgress: onProgress },
			);
		},
		onSettled: (_data, _error, { runId }) =>
			Promise.all([
				qc.invalidateQueries({ queryKey: runKeys.byVehicle(vehicleId) }),
				qc.invalidateQueries({ queryKey: runKeys.detail(runId) }),
			]),
	});
}
