import type { BuildDocument, UnitSystem } from '@/engine/browser';
import type { RevisionSummary } from '@/lib/client/queries/builds';
import { loadDraftCheck } from '@/lib/client/use-draft-check';
import { RelativeTime } from '@/components/ui/RelativeTime';

/**
 * "Load a JSON file": a build document from the member's disk, checked by the document's schema
 * before it replaces the draft; a file that is not JSON or not a build is refused by name.
 */
export function LoadJsonButton({
	onLoaded,
	onRefused,
}: {
	onLoaded: (doc: BuildDocument, fileName: string) => void;
	onRefused: (message: string) => void;
}) {
	return (
		<label className="cursor-pointer rounded-md border border-hairline bg-card px-3 py-2 text-sm font-semibold hover:border-copper">
			Load a JSON file
			<input
				type="file"
				accept="application/json,.json"
				className="sr-only"
				onChange={async (e) => {
					const f = e.target.files?.[0];
					e.target.value = '';
					if (!f) return;
					let raw: unknown;
					try {
						raw = JSON.parse(await f.text());
					} catch {
						return onRefused(`${f.name} is not valid JSON.`);
					}
					const { parseBuildDocument } = await loadDraftCheck();
					const parsed = parseBuildDocument(raw);
					if (!parsed.ok)
						return onRefused(
							`${f.name} was not loaded: ${parsed.problems
								.slice(0, 4)
								.map((p) => `${p.path || 'document'}: ${p.message}`)
								.join(' · ')}`,
						);
					onLoaded(parsed.doc, f.name);
				}}
			/>
		</label>
	);
}

/** The last five revisions and the way to the whole history. */
export function RecentRevisions({
	revisions,
	teamId,
	vehicleId,
}: {
	revisions: RevisionSummary[];
	teamId: string;
	vehicleId: string;
}) {
	return (
		<section aria-labelledby="recent-heading">
			<h2 id="recent-heading" className="text-xl font-bold">
				Recent revisions
			</h2>
			{revisions.length === 0 ? (
				<p className="mt-2 text-sm text-ink-soft">No revision saved yet.</p>
			) : (
				<ol className="mt-2 divide-y divide-hairline rounded-md border border-hairline bg-card text-sm">
					{revisions.slice(0, 5).map((r) => (
						<li key={r.id} className="flex flex-wrap gap-3 px-4 py-2">
							<span className="num font-semibold">r{r.number}</span>
							<span className="flex-1">{r.message}</span>
							<span className="text-ink-soft">
								{r.authorName ?? 'someone'} · <RelativeTime at={r.createdAt} />
							</span>
						</li>
					))}
				</ol>
			)}
			<a
				href={`/teams/${teamId}/vehicles/${vehicleId}/history`}
				className="mt-2 inline-block text-sm font-semibold text-copper-dark underline"
			>
				Full history with changes
			</a>
		</section>
	);
}

/**
 * The strip's note on the draft, always one line tall (a change appearing must not move the page
 * under the cursor): how many unsaved changes and what Save waits for, a click away from Save.
 */
export function UnsavedNote({
	changes,
	blocked,
	headNumber,
}: {
	changes: number;
	blocked: string | null;
	headNumber: number | null;
}) {
	return changes > 0 ? (
		<button
			type="button"
			className="mt-1 block h-5 w-full truncate rounded bg-amber-tint px-2 text-left text-xs font-semibold text-ink"
			onClick={() => {
				const field = document.getElementById('revision-message');
				field?.scrollIntoView({ block: 'center' });
				field?.focus({ preventScroll: true });
			}}
		>
			● {changes} unsaved change{changes === 1 ? '' : 's'}: {blocked ?? 'ready to save'} — go to
			Save
		</button>
	) : (
		<p className="mt-1 h-5 truncate px-2 text-xs text-ink-soft">
			No unsaved change: the draft is revision {headNumber ?? '—'}.
		</p>
	);
}

/** Feet and AWG, or metres and mm²: the member's choice, kept with their membership. */
export function UnitsChoice({
	units,
	onChoose,
}: {
	units: UnitSystem;
	onChoose: (u: UnitSystem) => void;
}) {
	return (
		<fieldset className="flex items-center gap-1 text-sm">
			<legend className="sr-only">Units</legend>
			{(['imperial', 'metric'] as const).map((u) => (
				<label
					key={u}
					className={`cursor-pointer rounded px-2 py-1 ${units === u ? 'bg-slate-deep text-paper' : 'bg-paper'}`}
				>
					<input
						type="radio"
						name="units"
						className="sr-only"
						checked={units === u}
						onChange={() => onChoose(u)}
					/>
					{u === 'imperial' ? 'ft · AWG' : 'm · mm²'}
				</label>
			))}
		</fieldset>
	);
}
