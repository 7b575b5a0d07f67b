import type { BudgetRow } from '@/engine/browser';
import { fmt } from '@/lib/format';
import { BudgetChart } from '../LazyCharts';
import { type ResultColumn, ResultTable, Unit } from './ResultTable';

const carry = (s: number | null) =>
	s === null ? 'no deficit' : s > 3600 ? `${fmt(s / 3600, 1)} h` : `${fmt(s / 60, 0)} min`;

const COLUMNS: ResultColumn<BudgetRow>[] = [
	{
		key: 'v',
		header: 'Supply',
		cell: (r) => (
			<>
				{fmt(r.voltageV, 1)} <Unit>V</Unit>
			</>
		),
	},
	{
		key: 'music',
		header: 'Music',
		align: 'right',
		cell: (r) => (
			<>
				{fmt(r.sustainedDemandA, 0)} <Unit>A</Unit>
			</>
		),
	},
	{
		key: 'burp',
		header: 'Burp',
		align: 'right',
		cell: (r) => (
			<>
				{fmt(r.burpDemandA, 0)} <Unit>A</Unit>
			</>
		),
	},
	{
		key: 'alt',
		header: 'Alternators',
		align: 'right',
		tone: () => 'text-teal',
		cell: (r) => (
			<>
				{fmt(r.alternatorSupplyA, 0)} <Unit>A</Unit>
			</>
		),
	},
	{
		key: 'surplus',
		header: 'Music surplus',
		align: 'right',
		tone: (r) => (r.sustainedSurplusA < 0 ? 'text-amber-text' : 'text-teal'),
		cell: (r) => (
			<>
				{r.sustainedSurplusA < 0 ? '▼ ' : '▲ '}
				{fmt(r.sustainedSurplusA, 0)} <Unit>A</Unit>
			</>
		),
	},
	{
		key: 'carry',
		header: 'Banks carry the burp for',
		align: 'right',
		cell: (r) => carry(r.burpCarrySeconds),
	},
];

/** Demand and supply at each fixed supply voltage: the chart, and the same figures as a table. */
export function BudgetSection({ rows }: { rows: BudgetRow[] }) {
	return (
		<section aria-labelledby="budget-heading" className="grid gap-6 lg:grid-cols-2">
			<div>
				<h3 id="budget-heading" className="text-lg font-bold">
					Demand and supply at fixed voltages
				</h3>
				<div className="mt-3 rounded-md border border-hairline bg-card p-3">
					<BudgetChart rows={rows} />
				</div>
			</div>
			<ResultTable
				rows={rows}
				rowKey={(r) => r.voltageV}
				columns={COLUMNS}
				caption="Budget at each supply voltage"
				className="mt-10 self-start"
			/>
		</section>
	);
}
