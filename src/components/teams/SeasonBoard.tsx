import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { FormMessage } from '@/components/ui/Field';
import { ScrollRegion } from '@/components/ui/ScrollRegion';
import { lazyChart } from '@/components/ui/lazy-chart';
import { ReceiptCell } from './ReceiptCell';
import { NewSeasonForm, PurchaseForm } from './season-forms';
import { withQueryClient } from '@/lib/client/query-client';
import {
	seasonQueryOptions,
	seasonsQueryOptions,
	useRemovePurchase,
} from '@/lib/client/queries/seasons';
import { formatMoney } from '@/lib/format';
import { minorToText } from '@/lib/money';
import type { SeasonDetail, SeasonDto } from '@/lib/schemas/seasons';
import type { ShelfItemDto } from '@/lib/shelf-kinds';

const SeasonSpendChart = lazyChart(
	() => import('./SeasonSpendChart').then((m) => m.SeasonSpendChart),
	'h-64',
);

/**
 * A season's money: the budget, what was spent (a chart over the season), plans committed
 * against what is left, each purchase, and what each paying member paid against an even share
 * with who pays whom to settle up. Every figure is whole cents added up; the server says them.
 */
export const SeasonBoard = withQueryClient(function SeasonBoard({
	teamId,
	canEdit,
	isCaptain,
	currency,
	today,
	initialSeasons,
	initialDetail,
	shelf,
}: {
	teamId: string;
	canEdit: boolean;
	isCaptain: boolean;
	currency: string;
	today: string;
	initialSeasons: SeasonDto[];
	initialDetail: SeasonDetail | null;
	shelf: ShelfItemDto[];
}) {
	const seasons = useQuery({ ...seasonsQueryOptions(teamId), initialData: initialSeasons });
	const [seasonId, setSeasonId] = useState<string | null>(initialDetail?.season.id ?? null);
	const detail = useQuery({
		...seasonQueryOptions(teamId, seasonId ?? ''),
		enabled: seasonId !== null,
		initialData: initialDetail && initialDetail.season.id === seasonId ? initialDetail : undefined,
	});
	const money = (minor: number) => formatMoney(minor / 100, currency);
	return (
		<div className="flex flex-col gap-6">
			<div className="flex flex-wrap items-end gap-3">
				{seasons.data.length > 0 && (
					<div className="flex flex-col gap-1">
						<label htmlFor="season-pick" className="text-sm font-semibold">
							Season
						</label>
						<select
							id="season-pick"
							value={seasonId ?? ''}
							onChange={(e) => setSeasonId(e.target.value || null)}
							className="rounded-md border border-hairline bg-card px-3 py-2"
						>
							{seasons.data.map((s) => (
								<option key={s.id} value={s.id}>
									{s.name} ({s.startsOn} to {s.endsOn})
								</option>
							))}
						</select>
					</div>
				)}
			</div>
			{isCaptain && (
				<NewSeasonForm teamId={teamId} today={today} onCreated={(id) => setSeasonId(id)} />
			)}
			{seasons.data.length === 0 && (
				<p className="rounded-md border border-dashed border-hairline bg-card p-4 text-sm text-ink-soft">
					No season yet.{' '}
					{isCaptain
						? 'Start one with its budget above; members then record what they buy.'
						: 'A captain starts one with its budget.'}
				</p>
			)}
			{seasonId && detail.isPending && (
				<p role="status" className="text-sm text-ink-soft">
					Reading the season…
				</p>
			)}
			{detail.isError && (
				<FormMessage tone="error">
					The season could not be read ({detail.error.message}).
				</FormMessage>
			)}
			{detail.data && (
				<SeasonView
					teamId={teamId}
					detail={detail.data}
					canEdit={canEdit}
					money={money}
					today={today}
					shelf={shelf}
				/>
			)}
		</div>
	);
});

function SeasonView({
	teamId,
	detail,
	canEdit,
	money,
	today,
	shelf,
}: {
	teamId: string;
	detail: SeasonDetail;
	canEdit: boolean;
	money: (minor: number) => string;
	today: string;
	shelf: ShelfItemDto[];
}) {
	const { season, purchases, settlement, committed } = detail;
	const left = season.budgetMinor - season.spentMinor;
	const committedMinor = committed.reduce((n, p) => n + p.totalMinor, 0);
	const remove = useRemovePurchase(teamId, season.id);
	return (
		<>
			<dl className="grid grid-cols-2 gap-3 sm:grid-cols-4" data-season-figures>
				{(
					[
						['Budget', season.budgetMinor],
						['Spent', season.spentMinor],
						['Left', left],
						['Left after plans', left - committedMinor],
					] as const
				).map(([k, minor]) => (
					<div key={k} className="rounded-md border border-hairline bg-card p-3">
						<dt className="text-xs font-semibold text-ink-soft uppercase">{k}</dt>
						{/* Over budget reads in red. */}
						<dd className={`num text-lg font-bold ${minor < 0 ? 'text-brick' : ''}`}>
							{money(minor)}
						</dd>
					</div>
				))}
			</dl>
			<section aria-labelledby="spend-heading">
				<h2 id="spend-heading" className="text-lg font-bold">
					Spent against the budget
				</h2>
				<SeasonSpendChart
					startsOn={season.startsOn}
					endsOn={season.endsOn}
					budgetMinor={season.budgetMinor}
					purchases={purchases.map((p) => ({
						boughtOn: p.boughtOn,
						amountMinor: p.quantity * p.unitPriceMinor,
					}))}
				/>
			</section>
			<section aria-labelledby="purchases-heading">
				<h2 id="purchases-heading" className="text-lg font-bold">
					Purchases ({purchases.length})
				</h2>
				{canEdit && <PurchaseForm teamId={teamId} detail={detail} today={today} shelf={shelf} />}
				<ScrollRegion label="Purchases" className="mt-3 rounded-md border border-hairline bg-card">
					<table className="w-full text-sm">
						<caption className="sr-only">Purchases of {season.name}</caption>
						<thead className="bg-paper text-left text-xs text-ink-soft">
							<tr>
								<th scope="col" className="px-3 py-2">
									Date
								</th>
								<th scope="col" className="px-3 py-2">
									Item
								</th>
								<th scope="col" className="px-3 py-2 text-right">
									Qty
								</th>
								<th scope="col" className="px-3 py-2 text-right">
									Unit price
								</th>
								<th scope="col" className="px-3 py-2 text-right">
									Total
								</th>
								<th scope="col" className="px-3 py-2">
									Paid by
								</th>
								<th scope="col" className="px-3 py-2">
									Receipt
								</th>
								{canEdit && (
									<th scope="col" className="px-3 py-2">
										<span className="sr-only">Remove</span>
									</th>
								)}
							</tr>
						</thead>
						<tbody>
							{purchases.map((p) => (
								<tr key={p.id} className="border-t border-hairline">
									<td className="px-3 py-2 whitespace-nowrap">{p.boughtOn}</td>
									<td className="px-3 py-2">
										{p.item}
										{p.notes && <span className="block text-xs text-ink-soft">{p.notes}</span>}
									</td>
									<td className="num px-3 py-2 text-right">{p.quantity}</td>
									<td className="num px-3 py-2 text-right">{minorToText(p.unitPriceMinor)}</td>
									<td className="num px-3 py-2 text-right">
										{money(p.quantity * p.unitPriceMinor)}
									</td>
									<td className="px-3 py-2">{p.paidByName}</td>
									<td className="px-3 py-2">
										<ReceiptCell
											teamId={teamId}
											seasonId={season.id}
											purchase={p}
											canEdit={canEdit}
										/>
									</td>
									{canEdit && (
										<td className="px-3 py-2">
											<button
												type="button"
												aria-label={`Remove the purchase of ${p.item} on ${p.boughtOn}`}
												className="rounded px-2 py-1 text-ink-soft hover:bg-brick-tint hover:text-brick"
												onClick={() => remove.mutate(p.id)}
											>
												✕
											</button>
										</td>
									)}
								</tr>
							))}
							{purchases.length === 0 && (
								<tr>
									<td colSpan={canEdit ? 8 : 7} className="px-3 py-3 text-ink-soft">
										Nothing bought in this season yet.
									</td>
								</tr>
							)}
						</tbody>
					</table>
				</ScrollRegion>
			</section>
			<section aria-labelledby="settle-heading">
				<h2 id="settle-heading" className="text-lg font-bold">
					Settling up
				</h2>
				<p className="text-sm text-ink-soft">
					Each captain and member’s even share of the {money(settlement.totalMinor)} spent, against
					what they paid. Viewers have no share.
				</p>
				<ScrollRegion
					label="Settling up"
					className="mt-2 rounded-md border border-hairline bg-card"
				>
					<table className="w-full text-sm" data-settlement>
						<caption className="sr-only">What each paid against an even share</caption>
						<thead className="bg-paper text-left text-xs text-ink-soft">
							<tr>
								<th scope="col" className="px-3 py-2">
									Who
								</th>
								<th scope="col" className="px-3 py-2 text-right">
									Paid
								</th>
								<th scope="col" className="px-3 py-2 text-right">
									Share
								</th>
								<th scope="col" className="px-3 py-2 text-right">
									Balance
								</th>
							</tr>
						</thead>
						<tbody>
							{settlement.lines.map((l) => (
								<tr key={l.id} className="border-t border-hairline">
									<td className="px-3 py-2">{l.name}</td>
									<td className="num px-3 py-2 text-right">{money(l.paidMinor)}</td>
									<td className="num px-3 py-2 text-right">{money(l.shareMinor)}</td>
									<td
										className={`num px-3 py-2 text-right font-semibold ${l.balanceMinor < 0 ? 'text-brick' : l.balanceMinor > 0 ? 'text-teal' : ''}`}
									>
										{l.balanceMinor > 0 ? 'is owed ' : l.balanceMinor < 0 ? 'owes ' : ''}
										{money(Math.abs(l.balanceMinor))}
									</td>
								</tr>
							))}
						</tbody>
					</table>
				</ScrollRegion>
				{settlement.transfers.length > 0 && (
					<ul className="mt-2 list-disc pl-5 text-sm" data-transfers>
						{settlement.transfers.map((t) => (
							<li key={`${t.from}>${t.to}`}>
								{t.from} pays {t.to} {money(t.amountMinor)}
							</li>
						))}
					</ul>
				)}
			</section>
			<section aria-labelledby="committed-heading">
				<h2 id="committed-heading" className="text-lg font-bold">
					Plans not yet installed
				</h2>
				{committed.length === 0 ? (
					<p className="text-sm text-ink-soft">No plan waits to be installed.</p>
				) : (
					<ul className="mt-1 flex flex-col gap-1 text-sm">
						{committed.map((p) => (
							<li key={p.id}>
								<a
									className="text-copper-dark underline"
									href={`/teams/${teamId}/vehicles/${p.vehicleId}/plans/${p.id}`}
								>
									{p.vehicleName}: {p.name}
								</a>{' '}
								<span className="num">{money(p.totalMinor)}</span>
							</li>
						))}
					</ul>
				)}
			</section>
		</>
	);
}
