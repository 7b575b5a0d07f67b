import { useState } from 'react';
import type { ComponentChange } from '@/engine/browser';
import { fieldName, formatFieldValue, GROUP_NAMES, type UnitSystem } from '@/lib/format';

/** Changes listed before "show all". */
const CHANGES_SHOWN = 40;

/** What the plan changes against the revision it started from, part by part. */
export function PlanChanges({
	changes,
	baseRevisionNumber,
	units,
}: {
	/** Null while not yet worked out (before the page is live). */
	changes: ComponentChange[] | null;
	baseRevisionNumber: number | null;
	units: UnitSystem;
}) {
	const [allChanges, setAllChanges] = useState(false);
	return (
		<section aria-labelledby="changes-heading">
			<h2 id="changes-heading" className="text-xl font-bold">
				What the plan changes
			</h2>
			{changes === null ? (
				<p className="mt-2 text-sm text-ink-soft">Working out what the plan changes…</p>
			) : changes.length === 0 ? (
				<p className="mt-2 text-sm text-ink-soft">
					Nothing yet: the plan is the same as revision {baseRevisionNumber}. Change it in the
					editor below.
				</p>
			) : (
				<ul className="mt-2 divide-y divide-hairline rounded-md border border-hairline bg-card text-sm">
					{(allChanges ? changes : changes.slice(0, CHANGES_SHOWN)).map((c) => (
						<li key={`${c.group}.${c.id}`} className="px-4 py-2">
							<span
								className={`mr-2 rounded px-1.5 py-0.5 text-xs font-semibold ${c.kind === 'added' ? 'bg-teal-tint text-teal' : c.kind === 'removed' ? 'bg-brick-tint text-brick' : 'bg-amber-tint'}`}
							>
								{c.kind}
							</span>
							{GROUP_NAMES[c.group]} <strong>{c.label}</strong>
							{c.kind === 'changed' &&
								`: ${c.fields.map((f) => `${fieldName(f.field)} ${formatFieldValue(f.field, f.before, units)} → ${formatFieldValue(f.field, f.after, units)}`).join('; ')}`}
						</li>
					))}
					{changes.length > CHANGES_SHOWN && (
						<li className="px-4 py-2">
							<button
								type="button"
								className="font-semibold text-copper-dark underline"
								onClick={() => setAllChanges((v) => !v)}
							>
								{allChanges
									? `Show the first ${CHANGES_SHOWN} only`
									: `Show all ${changes.length} changes`}
							</button>
						</li>
					)}
				</ul>
			)}
		</section>
	);
}
