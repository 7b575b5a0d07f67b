import type { ReportWarning } from '@/engine';

export const SAFETY_LINE =
	'These figures are estimates. Local codes, event rules and licensed practice govern high-current work.';

/** Findings in words, with the severity said as well as shown. */
export function WarningList({ warnings }: { warnings: ReportWarning[] }) {
	return (
		<ul className="flex flex-col gap-1">
			{warnings.map((w, i) => (
				<li key={i} className={`text-xs ${w.severity === 'danger' ? 'text-brick' : 'text-ink'}`}>
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

/** The build's findings that are not about one cable (those sit in the cable table). */
export function Findings({ warnings }: { warnings: ReportWarning[] }) {
	const build = warnings.filter((w) => w.element.kind !== 'cable');
	if (build.length === 0) return null;
	const safety = build.some((w) => w.safety);
	return (
		<section
			aria-labelledby="findings-heading"
			className={`rounded-md border p-4 ${safety ? 'border-brick/40 bg-brick-tint/40' : 'border-amber/40 bg-amber-tint/50'}`}
		>
			<h2 id="findings-heading" className="font-semibold">
				Findings
			</h2>
			<div className="mt-2">
				<WarningList warnings={build} />
			</div>
		</section>
	);
}
