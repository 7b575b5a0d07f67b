import { findingCounts, orderedFindings, type ReportWarning } from '@/engine/browser';

export const SAFETY_LINE =
	'These figures are estimates. Local codes, event rules and licensed practice govern high-current work.';

/** Findings in words, with the severity said as well as shown. */
export function WarningList({ warnings }: { warnings: ReportWarning[] }) {
	return (
		<ul className="flex flex-col gap-1">
			{warnings.map((w, i) => (
				<li
					key={i}
					className={`text-xs ${w.severity === 'danger' ? 'text-brick' : 'text-ink'}`}
					data-finding={w.severity}
				>
					<span aria-hidden="true">{w.severity === 'danger' ? '✕ ' : '⚠ '}</span>
					<span className="sr-only">
						{w.severity === 'danger' ? 'Safety finding: ' : 'Warning: '}
					</span>
					{w.message}
				</li>
			))}
			{warnings.some((w) => w.safety) && (
				<li className="text-xs italic text-ink-soft">{SAFETY_LINE}</li>
			)}
		</ul>
	);
}

/**
 * Every finding of the build, danger first: the same set the summary strip counts, the part tables
 * and the inspector show beside their parts, and the checks sheet and the plan comparison read.
 */
export function Findings({ warnings }: { warnings: ReportWarning[] | null }) {
	const all = warnings ? orderedFindings(warnings).filter((w) => w.severity !== 'info') : [];
	const counts = findingCounts(all);
	const safety = all.some((w) => w.safety);
	return (
		<section
			id="section-findings"
			aria-labelledby="findings-heading"
			className={`rounded-md border p-4 ${safety || counts.danger ? 'border-brick/40 bg-brick-tint/40' : all.length ? 'border-amber/40 bg-amber-tint/50' : 'border-hairline bg-card'}`}
			data-findings={warnings ? `${counts.danger}|${counts.warning}` : undefined}
		>
			<h2 id="findings-heading" className="font-semibold">
				<span data-section-focus tabIndex={-1}>
					Findings
				</span>{' '}
				{warnings && (
					<span className="text-sm font-normal text-ink-soft">
						{counts.danger} danger · {counts.warning} warning{counts.warning === 1 ? '' : 's'}
					</span>
				)}
			</h2>
			<div className="mt-2">
				{warnings === null ? (
					<p className="text-sm text-ink-soft">The findings follow once the figures are in.</p>
				) : all.length === 0 ? (
					<p className="text-sm text-ink-soft">
						Nothing to flag at these conditions: no cable, fuse, bank or amplifier is past a limit
						the engine checks.
					</p>
				) : (
					<WarningList warnings={all} />
				)}
			</div>
		</section>
	);
}
