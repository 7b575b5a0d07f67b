import { useState } from 'react';
import type { RunDto } from '@/lib/client/queries/runs';
import { fmt } from '@/lib/format';
import { MEASUREMENT_FIELDS, RUN_MEASUREMENTS } from '@/lib/schemas/run-measurements';
import { runVoltage } from '@/lib/run-figures';

/** On a phone the table keeps when, the score, the minimum voltage and the compare box in view. */
const onPhone = (f: string) => (f === 'scoreDb' || f === 'minV' ? '' : 'max-sm:hidden');
import { useLocalFormat } from '@/lib/client/local-time';
import { ScrollRegion } from '@/components/ui/ScrollRegion';

/** Rows per page of the table: a season's runs are paged, not all laid out at once. */
export const RUNS_PER_PAGE = 25;

/** The vehicle's runs, newest first: choose one to open it, and up to four to compare. */
export function RunsTable({
	teamId,
	vehicleId,
	runs: list,
	selected,
	onSelect: setSelected,
	compare,
	onCompare: setCompare,
}: {
	teamId: string;
	vehicleId: string;
	runs: RunDto[];
	selected: string | null;
	onSelect: (id: string) => void;
	compare: string[];
	onCompare: (ids: string[]) => void;
}) {
	const fmtTime = useLocalFormat();
	const [page, setPage] = useState(0);
	const pages = Math.max(1, Math.ceil(list.length / RUNS_PER_PAGE));
	const at = Math.min(page, pages - 1);
	const newestFirst = [...list].reverse();
	const shown = newestFirst.slice(at * RUNS_PER_PAGE, (at + 1) * RUNS_PER_PAGE);
	return (
		<section aria-labelledby="runs-heading">
			<div className="flex items-center gap-3">
				<h2 id="runs-heading" className="text-xl font-bold">
					Runs
				</h2>
				<a
					href={`/api/teams/${teamId}/runs/export.csv?vehicleId=${vehicleId}`}
					className="rounded-md border border-hairline bg-card px-2 py-0.5 text-sm hover:border-copper"
				>
					Download CSV
				</a>
			</div>
			{list.length === 0 ? (
				<p className="mt-3 rounded-md border border-dashed border-hairline bg-card p-6 text-ink-soft">
					No runs logged yet.
				</p>
			) : (
				<ScrollRegion label="Runs" className="mt-3 rounded-md border border-hairline bg-card">
					<table className="w-full text-sm">
						<thead className="bg-paper text-xs text-ink-soft">
							<tr>
								<th className="px-3 py-2 text-left">When</th>
								<th className="px-3 py-2 text-left max-sm:hidden">Event</th>
								<th className="px-3 py-2 text-left max-sm:hidden">Revision</th>
								{MEASUREMENT_FIELDS.map((f) => (
									<th key={f} className={`px-3 py-2 text-right ${onPhone(f)}`}>
										{RUN_MEASUREMENTS[f].short}
									</th>
								))}
								<th className="px-3 py-2 text-left max-sm:hidden">Logger</th>
								<th className="px-3 py-2 text-left">Compare</th>
							</tr>
						</thead>
						<tbody className="num">
							{shown.map((r) => (
								<tr
									key={r.id}
									className={`cursor-pointer border-t border-hairline ${selected === r.id ? 'bg-copper-tint/50' : 'hover:bg-paper'}`}
									onClick={() => setSelected(r.id)}
									data-run={r.id}
								>
									<td className="px-3 py-1.5 font-sans">
										<button
											type="button"
											className="text-left underline-offset-2 hover:underline"
											onClick={() => setSelected(r.id)}
										>
											{/* Date and time each kept whole: on a phone they take two lines, not four. */}
											<span className="whitespace-nowrap">{fmtTime(r.ranAt, 'd MMM yyyy')}</span>{' '}
											<span className="whitespace-nowrap">{fmtTime(r.ranAt, 'HH:mm')}</span>
										</button>
									</td>
									<td className="px-3 py-1.5 font-sans max-sm:hidden">
										{r.eventName ?? <span className="text-ink-soft">practice</span>}
									</td>
									<td className="px-3 py-1.5 max-sm:hidden">
										{r.revisionNumber ? `r${r.revisionNumber}` : '—'}
									</td>
									{MEASUREMENT_FIELDS.map((f) => {
										// Voltages from the logger file where the run has one, the typed figure beside.
										const v =
											f === 'restingV' || f === 'minV'
												? runVoltage(r, f)
												: { value: r[f], fromLogger: false, typed: null };
										return (
											<td key={f} className={`px-3 py-1.5 text-right ${onPhone(f)}`}>
												{fmt(v.value, RUN_MEASUREMENTS[f].decimals)}{' '}
												<span className="text-xs text-ink-soft">{RUN_MEASUREMENTS[f].unit}</span>
												{v.typed !== null && (
													<span
														className="block text-xs text-ink-soft"
														title="Typed on the run form"
													>
														typed {fmt(v.typed, RUN_MEASUREMENTS[f].decimals)}
													</span>
												)}
											</td>
										);
									})}
									<td className="px-3 py-1.5 font-sans max-sm:hidden">
										{r.hasLogger ? '✓ file' : '—'}
									</td>
									<td className="px-3 py-1.5 font-sans" onClick={(e) => e.stopPropagation()}>
										<label className="flex items-center gap-1 text-xs">
											<input
												type="checkbox"
												checked={compare.includes(r.id)}
												disabled={!compare.includes(r.id) && compare.length >= 4}
												onChange={(e) =>
													setCompare(
														e.target.checked
															? [...compare, r.id]
															: compare.filter((x) => x !== r.id),
													)
												}
											/>
											{compare.includes(r.id)
												? String.fromCharCode(65 + compare.indexOf(r.id))
												: 'add'}
											<span className="sr-only">
												{' '}
												to the comparison (run of {fmtTime(r.ranAt, 'd MMM yyyy HH:mm')})
											</span>
										</label>
									</td>
								</tr>
							))}
						</tbody>
					</table>
				</ScrollRegion>
			)}
			{pages > 1 && (
				<nav aria-label="Pages of runs" className="mt-2 flex flex-wrap items-center gap-3 text-sm">
					<button
						type="button"
						disabled={at === 0}
						onClick={() => setPage(at - 1)}
						className="rounded-md border border-hairline bg-card px-3 py-1 font-semibold hover:border-copper disabled:opacity-50"
					>
						← Newer
					</button>
					<span aria-live="polite">
						Runs {at * RUNS_PER_PAGE + 1}–{at * RUNS_PER_PAGE + shown.length} of {list.length}
					</span>
					<button
						type="button"
						disabled={at === pages - 1}
						onClick={() => setPage(at + 1)}
						className="rounded-md border border-hairline bg-card px-3 py-1 font-semibold hover:border-copper disabled:opacity-50"
					>
						Older →
					</button>
				</nav>
			)}
		</section>
	);
}
