import { format } from 'date-fns';
import { type RunDto, useRevisionDiff } from '@/lib/client/queries/runs';
import { fmt } from '@/lib/format';
import { MEASUREMENT_FIELDS, RUN_MEASUREMENTS } from '@/lib/schemas/run-measurements';

/** Two runs side by side: every measurement, and what changed between their revisions. */
export function RunComparison({
	teamId,
	vehicleId,
	a,
	b,
}: {
	teamId: string;
	vehicleId: string;
	a: RunDto;
	b: RunDto;
}) {
	const diff = useRevisionDiff(teamId, vehicleId, a.revisionId, b.revisionId);
	const row = (label: string, f: (r: RunDto) => string) => (
		<tr key={label} className="border-t border-hairline">
			<th scope="row" className="px-3 py-1.5 text-left font-normal text-ink-soft">
				{label}
			</th>
			<td className="num px-3 py-1.5">{f(a)}</td>
			<td className="num px-3 py-1.5">{f(b)}</td>
		</tr>
	);
	return (
		<section aria-labelledby="sbs-heading">
			<h2 id="sbs-heading" className="text-xl font-bold">
				Two runs side by side
			</h2>
			<table className="mt-3 w-full rounded-md border border-hairline bg-card text-sm">
				<thead className="bg-paper text-xs text-ink-soft">
					<tr>
						<th scope="col" className="px-3 py-2">
							<span className="sr-only">Measure</span>
						</th>
						<th scope="col" className="px-3 py-2 text-left">
							A
						</th>
						<th scope="col" className="px-3 py-2 text-left">
							B
						</th>
					</tr>
				</thead>
				<tbody>
					{row('When', (r) => format(new Date(r.ranAt), 'd MMM yyyy HH:mm'))}
					{MEASUREMENT_FIELDS.map((f) =>
						row(RUN_MEASUREMENTS[f].label, (r) =>
							r[f] === null
								? '—'
								: `${fmt(r[f], RUN_MEASUREMENTS[f].decimals)} ${RUN_MEASUREMENTS[f].unit}`,
						),
					)}
					{row('Revision', (r) => (r.revisionNumber ? `r${r.revisionNumber}` : '—'))}
				</tbody>
			</table>
			<p className="mt-2 text-sm">
				{a.revisionId === b.revisionId
					? 'Both runs were made on the same revision.'
					: diff.data
						? `Between their revisions: ${diff.data.changes.map((c) => `${c.label} (${c.kind})`).join(', ') || 'no change to the network'}.`
						: 'Comparing their revisions…'}
			</p>
		</section>
	);
}
