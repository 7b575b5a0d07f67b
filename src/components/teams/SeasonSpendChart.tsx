import '@/components/ui/chart-setup';
import { format } from 'date-fns';
import { Scatter } from 'react-chartjs-2';
import { minorToText } from '@/lib/money';

/**
 * A season's money over time: what has been spent so far (a step up at each purchase) against
 * the budget, from the season's first day to its last.
 */
export function SeasonSpendChart({
	startsOn,
	endsOn,
	budgetMinor,
	purchases,
}: {
	startsOn: string;
	endsOn: string;
	budgetMinor: number;
	purchases: Array<{ boughtOn: string; amountMinor: number }>;
}) {
	const t = (day: string) => Date.parse(`${day}T12:00:00Z`);
	const spent: Array<{ x: number; y: number }> = [{ x: t(startsOn), y: 0 }];
	let total = 0;
	for (const p of [...purchases].sort((a, b) => a.boughtOn.localeCompare(b.boughtOn))) {
		total += p.amountMinor;
		spent.push({ x: t(p.boughtOn), y: total / 100 });
	}
	spent.push({ x: Math.max(t(endsOn), spent.at(-1)!.x), y: total / 100 });
	const budget = [
		{ x: t(startsOn), y: budgetMinor / 100 },
		{ x: Math.max(t(endsOn), spent.at(-1)!.x), y: budgetMinor / 100 },
	];
	return (
		<div className="h-64" data-testid="season-spend">
			<Scatter
				data={
					{
						datasets: [
							{
								label: 'Spent so far',
								data: spent,
								borderColor: '#a85a23',
								backgroundColor: '#a85a23',
								showLine: true,
								stepped: 'before',
								pointRadius: 4,
							},
							{
								label: 'Budget',
								data: budget,
								borderColor: '#0f7076',
								backgroundColor: '#0f7076',
								borderDash: [6, 4],
								showLine: true,
								pointRadius: 0,
								pointStyle: 'line',
							},
						],
					} as never
				}
				options={{
					responsive: true,
					maintainAspectRatio: false,
					animation: false,
					scales: {
						x: {
							type: 'linear',
							// The season's own span: a linear axis would otherwise round out to dates before it.
							min: t(startsOn),
							max: budget[1]!.x,
							title: { display: true, text: 'Date' },
							ticks: { callback: (v) => format(new Date(Number(v)), 'd MMM') },
						},
						y: { beginAtZero: true, title: { display: true, text: 'Money' } },
					},
					plugins: {
						legend: { position: 'bottom', labels: { usePointStyle: true } },
						tooltip: {
							callbacks: {
								label: (c) =>
									`${c.dataset.label}: ${minorToText(Math.round((c.parsed.y ?? 0) * 100))}, ${format(new Date(c.parsed.x ?? 0), 'd MMM yyyy')}`,
							},
						},
					},
				}}
				role="img"
				aria-label={`Spent ${minorToText(total)} of a budget of ${minorToText(budgetMinor)} over the season`}
			/>
		</div>
	);
}
