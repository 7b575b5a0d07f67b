import type { SpeedPoint } from '@/engine/browser';
import { fmt } from '@/lib/format';
import { SweepChart } from '../LazyCharts';

/** The system from idle to high engine speed under burp: a chart and where the banks stop draining. */
export function SpeedSweepSection({
	sweep,
}: {
	sweep: { burp: SpeedPoint[]; sustained: SpeedPoint[] } | null;
}) {
	// The lowest speed from which the alternators carry the music on their own.
	const carries = sweep?.sustained.find((p) => !p.collapse && p.bankA <= 0.5);
	return (
		<section aria-labelledby="sweep-heading">
			<h3 id="sweep-heading" className="text-lg font-bold">
				From idle to high engine speed
			</h3>
			<div className="mt-3 rounded-md border border-hairline bg-card p-3">
				{sweep ? (
					<>
						<SweepChart points={sweep.burp} />
						<p className="mt-2 h-10 text-sm line-clamp-2" data-sweep-summary>
							{carries
								? `From ${carries.engineRpm} rpm the alternators carry the music without the banks.`
								: `At no speed up to ${sweep.sustained.at(-1)?.engineRpm ?? '—'} rpm do the alternators carry the music alone: the banks make up ${fmt(Math.max(0, sweep.sustained.at(-1)?.bankA ?? 0), 0)} A even there.`}
						</p>
					</>
				) : (
					// As tall as the chart and its line, so nothing below moves when they arrive.
					<p role="status" className="h-[19rem] text-sm text-ink-soft">
						Sweeping the engine speed…
					</p>
				)}
			</div>
		</section>
	);
}
