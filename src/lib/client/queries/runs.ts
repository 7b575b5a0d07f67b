import { queryOptions } from '@tanstack/react-query';
import type { RunAnalysis, Sample } from '@/engine/run-analysis';
import type { EventDto, RunDto } from '@/lib/server/db/runs';
import { getJson } from '../api-client';

export type { EventDto, RunDto };

export interface RunDetail {
	run: RunDto;
	samples: Sample[];
	analysis: RunAnalysis | null;
}

export const runKeys = {
	all: ['runs'] as const,
	byVehicle: (vehicleId: string) => [...runKeys.all, 'vehicle', vehicleId] as const,
	detail: (runId: string) => [...runKeys.all, 'detail', runId] as const,
};

export const vehicleRunsQueryOptions = (teamId: string, vehicleId: string) =>
	queryOptions({ queryKey: runKeys.byVehicle(vehicleId), queryFn: ({ signal }) => getJson<RunDto[]>(`/api/teams/${teamId}/runs?vehicleId=${vehicleId}`, { signal }) });

export const runDetailQueryOptions = (teamId: string, runId: string) =>
	queryOptions({ queryKey: runKeys.detail(runId), queryFn: ({ signal }) => getJson<RunDetail>(`/api/teams/${teamId}/runs/${runId}`, { signal }) });
