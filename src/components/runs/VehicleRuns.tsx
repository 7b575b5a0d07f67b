import { QueryClientProvider, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { onSent, startOutbox, useOnLeave, useOthersOutbox, useOutbox } from '@/lib/client/outbox';
import { getQueryClient } from '@/lib/client/query-client';
import {
	type EventDto,
	type RunDto,
	runKeys,
	vehicleRunsQueryOptions,
} from '@/lib/client/queries/runs';
import { fmt } from '@/lib/format';
import { runVoltage } from '@/lib/run-figures';
import type { RevisionSummary } from '@/lib/schemas/vehicles';
import { LogRunForm } from './LogRunForm';
import { OthersWaiting, OutboxList, SessionChangedNotice } from './OutboxList';
import { RunTraceComparison } from './RunTraceComparison';
import { RunDetailPanel } from './RunDetailPanel';
import { ScoresOverTimeChart, ScoreVsVoltageChart } from './RunCharts';
import { RunsTable } from './RunsTable';
import { useLocalFormat } from '@/lib/client/local-time';

export interface VehicleRunsProps {
	teamId: string;
	vehicleId: string;
	canEdit: boolean;
	initialRuns: RunDto[];
	/** The run to open first (a notification's link); the newest otherwise. */
	openRunId?: string | null;
	events: EventDto[];
	revisions: RevisionSummary[];
}

export function VehicleRuns(props: VehicleRunsProps) {
	return (
		<QueryClientProvider client={getQueryClient()}>
			<VehicleRunsView {...props} />
		</QueryClientProvider>
	);
}

export function VehicleRunsView({
	teamId,
	vehicleId,
	canEdit,
	initialRuns,
	openRunId = null,
	events,
	revisions,
}: VehicleRunsProps) {
	const runs = useQuery({
		...vehicleRunsQueryOptions(teamId, vehicleId),
		initialData: initialRuns,
	});
	const [selected, setSelected] = useState<string | null>(
		initialRuns.find((r) => r.id === openRunId)?.id ?? initialRuns.at(-1)?.id ?? null,
	);
	const [referenceId, setReferenceId] = useState<string | null>(null);
	const [compare, setCompare] = useState<string[]>([]);
	const fmtTime = useLocalFormat();
	const qc = useQueryClient();
	const waiting = useOutbox().filter((e) => e.kind === 'run' && e.vehicleId === vehicleId);
	const others = useOthersOutbox().filter((e) => e.kind === 'run' && e.vehicleId === vehicleId);
	useOnLeave(
		waiting.map((e) => e.id),
		() => void qc.invalidateQueries({ queryKey: runKeys.byVehicle(vehicleId) }),
	);
	useEffect(() => {
		startOutbox();
		return onSent((e, result) => {
			if (e.kind !== 'run' || e.vehicleId !== vehicleId) return;
			void qc.invalidateQueries({ queryKey: runKeys.byVehicle(vehicleId) });
			const id = (result as { id?: string } | null)?.id;
			if (id) setSelected(id);
		});
	}, [qc, vehicleId]);
	const list = runs.data;
	const reference =
		list.find((r) => r.id === referenceId) ??
		[...list]
			.filter((r) => r.scoreDb !== null && runVoltage(r, 'minV').value !== null)
			.sort((a, b) => b.scoreDb! - a.scoreDb!)[0] ??
		null;

	return (
		<div className="flex flex-col gap-8">
			{canEdit && (
				<LogRunForm
					teamId={teamId}
					vehicleId={vehicleId}
					events={events}
					revisions={revisions}
					onLogged={(id) => setSelected(id)}
				/>
			)}

			<SessionChangedNotice />
			<OutboxList entries={waiting} title="Runs waiting to be sent" />
			<OthersWaiting entries={others} />
			<RunsTable
				teamId={teamId}
				vehicleId={vehicleId}
				runs={list}
				selected={selected}
				onSelect={setSelected}
				compare={compare}
				onCompare={setCompare}
			/>
			{selected && (
				<RunDetailPanel
					teamId={teamId}
					vehicleId={vehicleId}
					runId={selected}
					canEdit={canEdit}
					onDeleted={() => setSelected(null)}
				/>
			)}

			{list.some((r) => r.scoreDb !== null) && (
				<section aria-labelledby="compare-heading" className="grid gap-6 lg:grid-cols-2">
					<div>
						<h2 id="compare-heading" className="text-xl font-bold">
							Scores over time
						</h2>
						<div className="mt-3 rounded-md border border-hairline bg-card p-3">
							<ScoresOverTimeChart runs={list} />
						</div>
					</div>
					<div>
						<h2 className="text-xl font-bold">Did the volts turn into decibels?</h2>
						<div className="mt-3 rounded-md border border-hairline bg-card p-3">
							<ScoreVsVoltageChart runs={list} reference={reference} />
							<label className="mt-2 flex items-center gap-2 text-sm">
								Reference run
								<select
									value={reference?.id ?? ''}
									onChange={(e) => setReferenceId(e.target.value || null)}
									className="rounded border border-hairline px-2 py-1"
								>
									{list
										.filter((r) => r.scoreDb !== null && runVoltage(r, 'minV').value !== null)
										.map((r) => (
											<option key={r.id} value={r.id}>
												{fmtTime(r.ranAt, 'd MMM yyyy')} · {fmt(r.scoreDb, 1)} dB at{' '}
												{fmt(runVoltage(r, 'minV').value)} V
											</option>
										))}
								</select>
							</label>
						</div>
					</div>
				</section>
			)}

			<RunTraceComparison
				teamId={teamId}
				vehicleRuns={list}
				ids={compare}
				onIdsChange={setCompare}
			/>
		</div>
	);
}
