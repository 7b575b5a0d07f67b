import { type BuildReport, headlineFigures } from '@/engine';
import { fmt } from '@/lib/format';

/** The key figures of the report, large. */
export function Readouts({ report }: { report: Extract<BuildReport, { ok: true }> }) {
	const h = headlineFigures(report);
	const minBurp = h.lowestAmpV ?? NaN;
	const worstDb = h.worstLossDb;
	const altShare = h.alternatorShare;
	const bankDraw = h.bankCurrentA;
	const bus = h.settleV ?? NaN;
	const items = [
		{
			label: 'System settles at, burp',
			value: report.burp.status === 'collapse' ? 'collapse' : fmt(bus),
			unit: report.burp.status === 'collapse' ? '' : 'V',
			tone: 'text-teal',
		},
		{
			label: 'Lowest amplifier, burp',
			value: report.burp.status === 'collapse' ? 'collapse' : fmt(minBurp),
			unit: report.burp.status === 'collapse' ? '' : 'V',
			tone: report.burp.status === 'collapse' ? 'text-brick' : 'text-ink',
		},
		{
			label: 'Worst output loss',
			value: fmt(worstDb),
			unit: 'dB',
			tone: worstDb < -1 ? 'text-amber-text' : 'text-ink',
		},
		{
			label: 'Alternators carry',
			value: fmt(altShare * 100, 0),
			unit: '% of the burp',
			tone: 'text-teal',
		},
		{
			label: 'Banks during music',
			value: bankDraw > 0.5 ? `▼ ${fmt(bankDraw, 0)}` : `▲ ${fmt(-bankDraw, 0)}`,
			unit: bankDraw > 0.5 ? 'A out' : 'A in',
			tone: bankDraw > 0.5 ? 'text-amber-text' : 'text-teal',
		},
		{
			label: 'Cable loss, burp',
			value: fmt(report.burp.power.cableLossW, 0),
			unit: 'W',
			tone: 'text-copper-dark',
		},
	];
	return (
		<section aria-label="Key figures" className="grid gap-3 sm:grid-cols-3 lg:grid-cols-6">
			{items.map((i) => (
				<div key={i.label} className="rounded-md border border-hairline bg-card p-3">
					<p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{i.label}</p>
					<p className={`num text-readout font-semibold ${i.tone}`}>
						{i.value} <span className="text-sm font-light text-ink-soft">{i.unit}</span>
					</p>
				</div>
			))}
		</section>
	);
}
