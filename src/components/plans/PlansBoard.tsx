import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { ApiError } from '@/lib/client/api-client';
import { getQueryClient } from '@/lib/client/query-client';
import type { RevisionSummary } from '@/lib/client/queries/builds';
import {
	compareQueryOptions,
	plansQueryOptions,
	type PlanSummary,
	useCreatePlan,
	useInstallPlan,
} from '@/lib/client/queries/plans';
import { formatMoney } from '@/lib/format';
import { Button, Field, FormMessage } from '@/components/ui/Field';
import { ComparisonTable } from './ComparisonTable';
import { RelativeTime } from '@/components/ui/RelativeTime';
import { type AddedDanger, installConfirmed } from '@/lib/client/install-plan';
import { ScrollRegion } from '@/components/ui/ScrollRegion';

export interface PlansBoardProps {
	teamId: string;
	vehicleId: string;
	canEdit: boolean;
	currency: string;
	head: { id: string; number: number; message: string } | null;
	revisions: RevisionSummary[];
	plans: PlanSummary[];
	/** Plans to compare on load (from ?compare=). */
	initialCompare: string[];
}

export function PlansBoard(props: PlansBoardProps) {
	return (
		<QueryClientProvider client={getQueryClient()}>
			<PlansBoardView {...props} />
		</QueryClientProvider>
	);
}

const MAX_COMPARED = 3;

function PlansBoardView({
	teamId,
	vehicleId,
	canEdit,
	currency,
	head: initialHead,
	revisions,
	plans: initialPlans,
	initialCompare,
}: PlansBoardProps) {
	const plans = useQuery({ ...plansQueryOptions(teamId, vehicleId), initialData: initialPlans });
	const [head, setHead] = useState(initialHead);
	const [selected, setSelected] = useState<string[]>(
		initialCompare.filter((id) => initialPlans.some((p) => p.id === id)).slice(0, MAX_COMPARED),
	);
	const [engineRpm, setEngineRpm] = useState(1500);
	const comparison = useQuery(compareQueryOptions(teamId, vehicleId, selected, engineRpm));
	const [installed, setInstalled] = useState<string | null>(null);

	// Keep the comparison in the address, so it can be shared and survives a reload.
	useEffect(() => {
		const url = new URL(window.location.href);
		if (selected.length) url.searchParams.set('compare', selected.join(','));
		else url.searchParams.delete('compare');
		window.history.replaceState(null, '', url);
	}, [selected]);

	const toggle = (id: string) =>
		setSelected((s) =>
			s.includes(id) ? s.filter((x) => x !== id) : s.length >= MAX_COMPARED ? s : [...s, id],
		);

	const installPlan = useInstallPlan(teamId, vehicleId);
	const install = {
		...installPlan,
		// The danger findings the comparison showed in its question are accepted; any other the
		// server finds is named in a second question (installConfirmed).
		mutate: (plan: { id: string; name: string; addedDangers: AddedDanger[] }) =>
			void installConfirmed(
				(acceptDangers) =>
					installPlan.mutateAsync({ planId: plan.id, parentId: head?.id ?? null, acceptDangers }),
				plan.name,
				plan.addedDangers,
			)
				.then((revision) => {
					if (!revision) return;
					setHead({ id: revision.id, number: revision.number, message: revision.message });
					setInstalled(`“${plan.name}” is now revision ${revision.number} of the build.`);
				})
				// Shown from the mutation's own error state below.
				.catch(() => undefined),
	};

	return (
		<div className="flex flex-col gap-8">
			{canEdit && (
				<NewPlanForm
					teamId={teamId}
					vehicleId={vehicleId}
					revisions={revisions}
					headId={head?.id ?? null}
				/>
			)}

			<section aria-labelledby="plans-heading">
				<h2 id="plans-heading" className="text-xl font-bold">
					Plans for this vehicle
				</h2>
				<p className="text-sm text-ink-soft">
					Tick up to {MAX_COMPARED} plans to set them beside the current build.
				</p>
				{plans.data.length === 0 ? (
					<p className="mt-3 rounded-md border border-dashed border-hairline bg-card p-4 text-sm text-ink-soft">
						No plans yet.{' '}
						{canEdit
							? 'Start one from the current revision above: change it in the editor and list the parts it needs.'
							: 'Members and captains start plans.'}
					</p>
				) : (
					<ScrollRegion label="Plans" className="mt-3 rounded-md border border-hairline bg-card">
						<table className="w-full text-sm">
							<caption className="sr-only">Plans</caption>
							<thead className="bg-paper text-xs text-ink-soft">
								<tr>
									<th className="w-20 px-3 py-2 text-left">Compare</th>
									<th className="px-3 py-2 text-left">Plan</th>
									<th className="px-3 py-2 text-left max-sm:hidden">Starts from</th>
									<th className="px-3 py-2 text-right max-sm:hidden">Parts</th>
									<th className="px-3 py-2 text-right">Cost</th>
									<th className="px-3 py-2 text-left">Status</th>
								</tr>
							</thead>
							<tbody>
								{plans.data.map((p) => {
									const on = selected.includes(p.id);
									return (
										<tr
											key={p.id}
											className={`border-t border-hairline ${on ? 'bg-copper-tint/40' : ''}`}
										>
											<td className="px-3 py-2">
												<input
													type="checkbox"
													className="size-4 accent-copper"
													checked={on}
													disabled={!on && selected.length >= MAX_COMPARED}
													onChange={() => toggle(p.id)}
													aria-label={`Compare ${p.name}`}
												/>
											</td>
											<td className="px-3 py-2">
												<a
													href={`/teams/${teamId}/vehicles/${vehicleId}/plans/${p.id}`}
													className="font-semibold text-copper-dark underline"
												>
													{p.name}
												</a>
												{p.notes && <p className="text-xs text-ink-soft">{p.notes}</p>}
											</td>
											<td className="px-3 py-2 text-ink-soft max-sm:hidden">
												{p.baseRevisionNumber ? `revision ${p.baseRevisionNumber}` : '—'} ·{' '}
												{p.authorName ?? 'someone'}, <RelativeTime at={p.updatedAt} />
											</td>
											<td className="num px-3 py-2 text-right max-sm:hidden">{p.partCount}</td>
											<td className="num px-3 py-2 text-right">{formatMoney(p.total, currency)}</td>
											<td className="px-3 py-2">
												{p.installedRevisionNumber ? (
													<span className="rounded bg-teal-tint px-2 py-0.5 text-xs font-semibold text-teal">
														✓ installed as r{p.installedRevisionNumber}
													</span>
												) : (
													<span className="text-xs text-ink-soft">planned</span>
												)}
											</td>
										</tr>
									);
								})}
							</tbody>
						</table>
					</ScrollRegion>
				)}
			</section>

			<section aria-labelledby="compare-heading" className="print:break-before-page">
				<div className="flex flex-wrap items-end justify-between gap-3">
					<div>
						<h2 id="compare-heading" className="text-xl font-bold">
							Side by side
						</h2>
						<p className="text-sm text-ink-soft">
							{head
								? `Revision ${head.number} (${head.message}) against the ticked plans, each solved on its own by the same engine as the build page.`
								: 'Save a first revision of the build to compare plans with it.'}
						</p>
					</div>
					<label className="flex items-center gap-2 text-sm">
						<span className="font-semibold">Engine speed</span>
						<select
							value={engineRpm}
							onChange={(e) => setEngineRpm(Number(e.target.value))}
							className="num rounded-md border border-hairline bg-card px-2 py-1"
						>
							{[0, 800, 1500, 2500, 4000].map((r) => (
								<option key={r} value={r}>
									{r === 0 ? 'engine off' : `${r} rpm`}
								</option>
							))}
						</select>
					</label>
				</div>
				{installed && (
					<div className="mt-3">
						<FormMessage tone="ok">
							{installed}{' '}
							<a
								className="font-semibold underline"
								href={`/teams/${teamId}/vehicles/${vehicleId}/history`}
							>
								See the history
							</a>
						</FormMessage>
					</div>
				)}
				{install.error && (
					<div className="mt-3">
						<FormMessage tone="error">
							{install.error instanceof ApiError
								? install.error.message
								: 'Could not reach the server; nothing was installed.'}
						</FormMessage>
					</div>
				)}
				<div className="mt-3">
					{selected.length === 0 ? (
						<p className="rounded-md border border-dashed border-hairline bg-card p-4 text-sm text-ink-soft">
							Tick one to three plans above to compare them with the current build.
						</p>
					) : comparison.isPending ? (
						<p
							role="status"
							className="rounded-md border border-hairline bg-card p-4 text-sm text-ink-soft"
						>
							Solving the current build and {selected.length} plan{selected.length === 1 ? '' : 's'}
							…
						</p>
					) : comparison.isError ? (
						<FormMessage tone="error">
							{comparison.error instanceof ApiError
								? comparison.error.message
								: 'Could not reach the server.'}
						</FormMessage>
					) : (
						<ComparisonTable
							data={comparison.data}
							canInstall={canEdit}
							installing={install.isPending ? (install.variables?.planId ?? null) : null}
							installed={
								new Map(
									plans.data
										.filter((p) => p.installedRevisionNumber)
										.map((p) => [p.id, p.installedRevisionNumber!]),
								)
							}
							onInstall={(col) =>
								install.mutate({ id: col.id, name: col.name, addedDangers: col.addedDangers })
							}
						/>
					)}
				</div>
			</section>
		</div>
	);
}

function NewPlanForm({
	teamId,
	vehicleId,
	revisions,
	headId,
}: {
	teamId: string;
	vehicleId: string;
	revisions: RevisionSummary[];
	headId: string | null;
}) {
	const [name, setName] = useState('');
	const [from, setFrom] = useState(headId ?? '');
	const createPlan = useCreatePlan(teamId, vehicleId);
	const create = {
		...createPlan,
		mutate: () =>
			createPlan.mutate(
				{ name, ...(from && { fromRevisionId: from }) },
				{
					onSuccess: (plan) =>
						window.location.assign(`/teams/${teamId}/vehicles/${vehicleId}/plans/${plan.id}`),
				},
			),
	};
	const errors = create.error instanceof ApiError ? create.error.byField() : {};
	if (revisions.length === 0)
		return (
			<FormMessage tone="info">
				Save a first revision of the build; plans start from one.
			</FormMessage>
		);
	return (
		<form
			className="flex flex-wrap items-end gap-3 rounded-md border border-hairline bg-card p-4"
			onSubmit={(e) => {
				e.preventDefault();
				create.mutate();
			}}
		>
			<Field
				label="New plan"
				placeholder="e.g. Second alternator and 4/0 run"
				value={name}
				onChange={(e) => setName(e.target.value)}
				error={errors.name}
				maxLength={120}
				className="min-w-72 flex-1"
				required
			/>
			<div className="flex min-w-0 max-w-full flex-col gap-1">
				<label htmlFor="plan-from" className="text-sm font-semibold">
					Starts from
				</label>
				<select
					id="plan-from"
					value={from}
					onChange={(e) => setFrom(e.target.value)}
					className="max-w-full truncate rounded-md border border-hairline bg-card px-3 py-2"
				>
					{revisions.map((r) => (
						<option key={r.id} value={r.id}>
							r{r.number} · {r.message.slice(0, 60)}
							{r.id === headId ? ' (current)' : ''}
						</option>
					))}
				</select>
			</div>
			<Button type="submit" busy={create.isPending} disabled={name.trim() === ''}>
				Start the plan
			</Button>
			{create.error && !errors.name && (
				<FormMessage tone="error">
					{create.error instanceof ApiError ? create.error.message : 'Could not reach the server.'}
				</FormMessage>
			)}
		</form>
	);
}
