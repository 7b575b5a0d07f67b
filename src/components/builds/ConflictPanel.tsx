import type { BuildDocument } from '@/engine/browser';
import type { RevisionDto } from '@/lib/client/queries/builds';
import { fieldName, formatFieldValue, GROUP_NAMES, type UnitSystem } from '@/lib/format';
import { Button } from '@/components/ui/Field';
import { diffBuilds } from '@/engine/browser';

/** A revision saved by someone else while this draft was edited: what differs, and the two ways on. */
export function ConflictPanel({
	theirs,
	mine,
	units,
	onKeepMine,
	onTakeTheirs,
}: {
	theirs: RevisionDto;
	mine: BuildDocument;
	units: UnitSystem;
	onKeepMine: () => void;
	onTakeTheirs: () => void;
}) {
	const diff = diffBuilds(theirs.document, mine);
	return (
		<div role="alert" className="rounded-md border border-amber/60 bg-amber-tint p-3 text-sm">
			<p className="font-semibold">
				Revision {theirs.number} (“{theirs.message}”, by {theirs.authorName ?? 'someone'}) was saved
				while you edited.
			</p>
			<p className="mt-1">
				Your draft differs from it in {diff.length} part{diff.length === 1 ? '' : 's'}:
			</p>
			<ul className="mt-1 list-disc pl-5">
				{diff.slice(0, 8).map((c) => (
					<li key={`${c.group}.${c.id}`}>
						{GROUP_NAMES[c.group]} {c.label}:{' '}
						{c.kind === 'changed'
							? c.fields
									.map(
										(f) =>
											`${fieldName(f.field)} ${formatFieldValue(f.field, f.before, units)} → ${formatFieldValue(f.field, f.after, units)}`,
									)
									.join('; ')
							: c.kind === 'added'
								? 'only in yours'
								: 'only in theirs'}
					</li>
				))}
			</ul>
			<div className="mt-2 flex flex-wrap gap-2">
				<Button onClick={onKeepMine}>Save mine on top of theirs</Button>
				<Button variant="secondary" onClick={onTakeTheirs}>
					Drop mine, load theirs
				</Button>
			</div>
		</div>
	);
}
