import type { BurpRun, BuildDocument } from '@/engine/browser';
import { fmt } from '@/lib/format';
import { BurpChart } from '../LazyCharts';

/** The time-stepped burp: each amplifier's and bank's voltage through it, and where the energy went. */
export function BurpSection({
	burp,
	burpSeconds,
	draft,
	ruleV,
}: {
	burp: BurpRun | null;
	burpSeconds: number;
	draft: BuildDocument;
	ruleV: number | null;
}) {
	return (
		<section aria-labelledby="burp-heading">
			<h3 id="burp-heading" className="text-lg font-bold">
				A {burpSeconds} s burp, step by step
			</h3>
			<div className="mt-3 rounded-md border border-hairline bg-card p-3">
				{burp ? (
					<>
						<BurpChart
							run={burp}
							bankLabels={Object.fromEntries(draft.banks.map((b) => [b.id, b.label]))}
							ruleV={ruleV}
						/>
						<p className="num mt-2 h-10 text-sm line-clamp-2">
							Energy: {fmt(burp.energyWh.amplifiers, 1)} Wh into the amplifiers,{' '}
							{fmt(burp.energyWh.banks, 1)} Wh from the banks, {fmt(burp.energyWh.alternators, 1)}{' '}
							Wh from the alternators, {fmt(burp.energyWh.cableLoss, 1)} Wh lost in cables.
							{burp.collapsedAtS !== null && (
								<span className="text-brick">
									{' '}
									✕ Voltage collapses after {fmt(burp.collapsedAtS, 2)} s.
								</span>
							)}
						</p>
					</>
				) : (
					// As tall as the chart and its line, so nothing below moves when they arrive.
					<p role="status" className="h-[19rem] text-sm text-ink-soft">
						Computing the burp…
					</p>
				)}
			</div>
		</section>
	);
}
