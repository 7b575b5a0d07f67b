import type { UpgradeHint } from '@/engine';
import { fmt } from '@/lib/format';
import { Unit } from './ResultTable';

/** Single upgrades, each solved on its own, ranked by the voltage it gives back at the weakest amplifier. */
export function UpgradeHintsSection({ hints }: { hints: UpgradeHint[] | null }) {
	return (
		<section aria-labelledby="hints-heading">
			<h2 id="hints-heading" className="text-xl font-bold">
				Where the volts go: single upgrades ranked
			</h2>
			<p className="text-sm text-ink-soft">
				Each line is one change, solved on its own, ranked by the voltage it gives back at the
				weakest amplifier under the burp.
			</p>
			{hints === null ? (
				<p role="status" className="mt-2 text-sm text-ink-soft">
					Ranking upgrades…
				</p>
			) : hints.length === 0 ? (
				<p className="mt-2 text-sm text-ink-soft">No amplifier to rank upgrades for.</p>
			) : (
				<ol className="mt-3 divide-y divide-hairline rounded-md border border-hairline bg-card text-sm">
					{hints.map((h, i) => (
						<li
							key={`${h.kind}-${h.targetId}`}
							className="flex flex-wrap items-center gap-3 px-4 py-2"
						>
							<span className="num w-6 text-ink-soft">{i + 1}.</span>
							<span className="flex-1">{h.description}</span>
							<span
								className={`num font-semibold ${h.gainV > 0.005 ? 'text-teal' : 'text-ink-soft'}`}
							>
								{h.gainV >= 0 ? '+' : ''}
								{fmt(h.gainV, 3)} <Unit>V</Unit>
							</span>
							<span className="num text-ink-soft">
								→ {fmt(h.afterV)} <Unit>V</Unit>
							</span>
						</li>
					))}
				</ol>
			)}
		</section>
	);
}
