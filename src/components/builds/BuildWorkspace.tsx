import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useEffect, useMemo, useState } from 'react';
import { diffBuilds, type BuildDocument, type UpgradeHint } from '@/engine/browser';
import { ApiError } from '@/lib/client/api-client';
import { buildDrafts } from '@/lib/client/draft-store';
import { useSetUnits } from '@/lib/client/queries/account';
import { getQueryClient } from '@/lib/client/query-client';
import { unpackJson } from '@/lib/packed-json';
import {
	fetchHeadRevision,
	type RevisionDto,
	type RevisionSummary,
	revisionsQueryOptions,
	useSaveRevision,
} from '@/lib/client/queries/builds';
import { fmt, type UnitSystem } from '@/lib/format';
import { useCreatePlan } from '@/lib/client/queries/plans';
import { Button, FormMessage } from '@/components/ui/Field';
import { starterDocument } from './new-parts';
import { useDraftCheck } from '@/lib/client/use-draft-check';
import { ShelfContext } from './shelf-context';
import { Workbench } from './Workbench';

import { sameJson } from '@/lib/same-json';
import { ConflictPanel } from './ConflictPanel';
import { LoadJsonButton, RecentRevisions, UnitsChoice, UnsavedNote } from './build-page-parts';

export interface BuildWorkspaceProps {
	teamId: string;
	vehicleId: string;
	vehicleName: string;
	canEdit: boolean;
	head: RevisionDto | null;
	/**
	 * The server's field check of `head` (empty when it reads): the page need not load its own.
	 * Null when the server could not check it (the engine was busy): the browser checks it then.
	 */
	headErrors?: Record<string, string> | null;
	revisions: RevisionSummary[];
	units: UnitSystem;
	/**
	 * Whether the server worked out the saved head's figures for the first render (in the engine's
	 * pool). When it did not (no head, or the engine was busy) the browser works them out once live.
	 */
	figuresServed?: boolean;
}

const NO_ERRORS: Record<string, string> = {};

/** What the page hands over packed (see packJson): the saved head and the revisions list. */
export interface SavedBuild {
	head: RevisionDto | null;
	revisions: RevisionSummary[];
}

export function BuildWorkspace({
	savedPacked,
	...props
}: Omit<BuildWorkspaceProps, keyof SavedBuild> & { savedPacked: string }) {
	const saved = useMemo(() => unpackJson<SavedBuild>(savedPacked), [savedPacked]);
	return (
		<QueryClientProvider client={getQueryClient()}>
			<BuildWorkspaceView {...props} {...saved} />
		</QueryClientProvider>
	);
}

export function BuildWorkspaceView({
	teamId,
	vehicleId,
	vehicleName,
	canEdit,
	head: initialHead,
	headErrors = NO_ERRORS,
	revisions: initialRevisions,
	units: initialUnits,
	figuresServed = false,
}: BuildWorkspaceProps) {
	const saveRevision = useSaveRevision(teamId, vehicleId);
	const createPlan = useCreatePlan(teamId, vehicleId);
	const setUnitsOnAccount = useSetUnits();
	const [head, setHead] = useState<RevisionDto | null>(initialHead);
	const baseDoc = head?.document ?? starterDocument();
	const [draft, setDraft] = useState<BuildDocument>(baseDoc);
	const [baseId, setBaseId] = useState<string | null>(head?.id ?? null);
	const [message, setMessage] = useState('');
	const [restored, setRestored] = useState<string | null>(null);
	const [units, setUnits] = useState<UnitSystem>(initialUnits);
	const [saveState, setSaveState] = useState<{
		busy: boolean;
		error: string | null;
		ok: string | null;
		conflict: RevisionDto | null;
	}>({ busy: false, error: null, ok: null, conflict: null });
	const revisions = useQuery({
		...revisionsQueryOptions(teamId, vehicleId),
		initialData: initialRevisions,
	});

	// Bring back an unsaved draft from this browser.
	useEffect(() => {
		if (!canEdit) return;
		const stored = buildDrafts.load(vehicleId);
		if (stored && !sameJson(stored.document, baseDoc)) {
			setDraft(stored.document);
			setMessage(stored.message);
			setBaseId(stored.baseRevisionId);
			setRestored(
				stored.baseRevisionId === (initialHead?.id ?? null)
					? 'Your unsaved changes from this browser are back.'
					: 'Your unsaved changes are back, but they were based on an older revision; saving will ask you to compare.',
			);
		}
		// eslint-disable-next-line react-hooks/exhaustive-deps -- once, on mount: what changes later is the member's own editing
	}, []);

	// Per keystroke: plain JSON (the draft is made from the base by spreads, so key order holds).
	const dirty = JSON.stringify(draft) !== JSON.stringify(baseDoc) || baseId !== (head?.id ?? null);
	useEffect(() => {
		if (!canEdit || !dirty) return;
		// Kept in the next task, after the keystroke's frame is painted: every keystroke is kept, none
		// waits for the write.
		const t = setTimeout(() =>
			buildDrafts.store(vehicleId, { baseRevisionId: baseId, document: draft, message }),
		);
		return () => clearTimeout(t);
	}, [canEdit, dirty, vehicleId, baseId, draft, message]);

	// A document the server handed over was checked there (the first head by this page's render, a
	// saved or conflicting one by the save); any other draft by the field check, once it is in.
	const { check, want } = useDraftCheck();
	const checked =
		head !== null &&
		draft === head.document &&
		(head.id !== initialHead?.id || headErrors !== null);
	const errors = useMemo(
		() =>
			checked
				? head.id === initialHead?.id
					? (headErrors ?? NO_ERRORS)
					: NO_ERRORS
				: check
					? check.validateDraft(draft)
					: null,
		[checked, head, initialHead, headErrors, check, draft],
	);
	useEffect(() => {
		if (!checked) want();
	}, [checked, want]);
	const checking = errors === null;
	const errorCount = errors ? Object.keys(errors).length : 0;
	const valid = !checking && errorCount === 0;
	/** Why Save is not available, in words (null when it is). */
	const saveBlocked = !dirty
		? 'Nothing to save: the draft matches the saved revision.'
		: checking
			? 'Checking the change…'
			: !valid
				? `Fix the ${errorCount === 1 ? 'marked field' : `${errorCount} marked fields`} to save.`
				: message.trim() === ''
					? 'Add a message saying what changed to save.'
					: null;
	// The draft as first served is the head itself: nothing to compare (and nothing to walk).
	const changes = useMemo(
		() => (head && draft !== head.document ? diffBuilds(head.document, draft) : []),
		[head, draft],
	);

	async function save(parentId: string | null) {
		setSaveState({ busy: true, error: null, ok: null, conflict: null });
		try {
			const saved = await saveRevision.mutateAsync({ parentId, message, document: draft });
			buildDrafts.clear(vehicleId);
			setHead(saved);
			setBaseId(saved.id);
			setDraft(saved.document);
			setMessage('');
			setRestored(null);
			setSaveState({
				busy: false,
				error: null,
				ok: `Saved as revision ${saved.number}.`,
				conflict: null,
			});
		} catch (e) {
			if (e instanceof ApiError && e.status === 409) {
				const theirs = await fetchHeadRevision(teamId, vehicleId).catch(() => null);
				setSaveState({ busy: false, error: e.message, ok: null, conflict: theirs });
			} else {
				setSaveState({
					busy: false,
					error:
						e instanceof ApiError
							? e.message
							: 'Could not reach the server; your draft is kept in this browser.',
					ok: null,
					conflict: null,
				});
			}
		}
	}

	/** A ranked upgrade as a plan holding the change (and the draft's unsaved edits, if any). */
	async function makePlan(hint: UpgradeHint): Promise<string> {
		try {
			const plan = await createPlan.mutateAsync({
				name: hint.description.slice(0, 120),
				...(baseId ? { fromRevisionId: baseId } : {}),
				document: hint.document,
				notes:
					`Made from the ranked upgrades: ${hint.description}. At the weakest amplifier under the burp ` +
					`${hint.gainV >= 0 ? '+' : ''}${fmt(hint.gainV, 3)} V (${fmt(hint.beforeV)} → ${fmt(hint.afterV)} V)` +
					(hint.gainDb === null
						? '.'
						: `, ${hint.gainDb >= 0 ? '+' : ''}${fmt(hint.gainDb, 2)} dB.`),
			});
			return `/teams/${teamId}/vehicles/${vehicleId}/plans/${plan.id}`;
		} catch (e) {
			throw new Error(
				e instanceof ApiError ? e.message : 'Could not reach the server to make the plan.',
			);
		}
	}

	async function saveUnits(next: UnitSystem) {
		setUnits(next);
		setUnitsOnAccount.mutate(next);
	}

	const shelf = useMemo(() => ({ teamId }), [teamId]);
	return (
		<div
			className="flex flex-col gap-8"
			// The field check arrives while the member reaches for a field, before the first keystroke.
			onFocusCapture={canEdit ? want : undefined}
			onPointerDownCapture={canEdit ? want : undefined}
		>
			<ShelfContext.Provider value={shelf}>
				<Workbench
					draft={draft}
					errors={errors ?? NO_ERRORS}
					checking={checking}
					units={units}
					canEdit={canEdit}
					baseline={head ? baseDoc : null}
					baselineRevisionId={head?.id ?? null}
					computeOnServer={figuresServed}
					sections="build"
					onMakePlan={makePlan}
					// The draft and its save box sit right under the key figures, not above them.
					afterSummary={
						<section
							aria-label="Draft and saving"
							className="-mx-2 flex flex-col gap-2 rounded-md border border-hairline bg-card/95 p-3 shadow-sm backdrop-blur"
						>
							<div className="flex flex-wrap items-center gap-3">
								<span className="text-sm">
									{head ? (
										<>
											Based on <strong>revision {head.number}</strong> · {head.message}
										</>
									) : (
										<strong>No revision yet: this is a starting point</strong>
									)}
								</span>
								{dirty && (
									<span className="rounded bg-amber-tint px-2 py-0.5 text-xs font-semibold text-ink">
										● {changes.length} unsaved change{changes.length === 1 ? '' : 's'}
									</span>
								)}
								{errorCount > 0 && (
									<span className="rounded bg-brick-tint px-2 py-0.5 text-xs font-semibold text-brick">
										✕ {errorCount} field{errorCount === 1 ? '' : 's'} to fix
									</span>
								)}
								<span className="flex-1" />
								<UnitsChoice units={units} onChoose={(u) => void saveUnits(u)} />
							</div>
							{canEdit && (
								<form
									className="flex flex-wrap items-center gap-2"
									onSubmit={(e) => {
										e.preventDefault();
										void save(baseId);
									}}
								>
									<label htmlFor="revision-message" className="sr-only">
										What changed and why
									</label>
									<input
										id="revision-message"
										value={message}
										onChange={(e) => setMessage(e.target.value)}
										placeholder="What changed and why (e.g. run upgraded to 1/0 after the last event)"
										className="min-w-72 flex-1 rounded-md border border-hairline bg-card px-3 py-2"
										maxLength={500}
									/>
									<Button
										type="submit"
										busy={saveState.busy}
										disabled={saveBlocked !== null}
										aria-describedby="save-blocked"
									>
										Save revision
									</Button>

									<LoadJsonButton
										onLoaded={(doc, name) => {
											setDraft(doc);
											setSaveState((st) => ({
												...st,
												error: null,
												ok: `${name} is loaded into the draft; save it as a revision to keep it.`,
											}));
										}}
										onRefused={(error) => setSaveState((st) => ({ ...st, ok: null, error }))}
									/>
									{dirty && (
										<Button
											type="button"
											variant="secondary"
											onClick={() => {
												if (!window.confirm('Throw away the unsaved changes?')) return;
												buildDrafts.clear(vehicleId);
												setDraft(baseDoc);
												setBaseId(head?.id ?? null);
												setRestored(null);
											}}
										>
											Discard
										</Button>
									)}
								</form>
							)}
							{canEdit && (
								// Always there and one line tall: its words change as the draft does, its height never.
								<p
									id="save-blocked"
									className="h-5 truncate text-sm text-ink-soft"
									data-save-blocked
									aria-live="polite"
								>
									{saveBlocked ?? 'Ready to save.'}
								</p>
							)}
							{restored && <FormMessage tone="info">{restored}</FormMessage>}
							{saveState.ok && (
								<FormMessage tone="ok">
									{saveState.ok}{' '}
									<a
										className="font-semibold underline"
										href={`/teams/${teamId}/vehicles/${vehicleId}/history`}
									>
										See the history
									</a>
								</FormMessage>
							)}
							{saveState.error && <FormMessage tone="error">{saveState.error}</FormMessage>}
							{saveState.conflict && (
								<ConflictPanel
									theirs={saveState.conflict}
									mine={draft}
									units={units}
									onKeepMine={() => {
										setHead(saveState.conflict);
										void save(saveState.conflict!.id);
									}}
									onTakeTheirs={() => {
										buildDrafts.clear(vehicleId);
										setHead(saveState.conflict);
										setBaseId(saveState.conflict!.id);
										setDraft(saveState.conflict!.document);
										setSaveState({ busy: false, error: null, ok: null, conflict: null });
									}}
								/>
							)}
						</section>
					}
					summaryExtra={
						canEdit && (
							<UnsavedNote
								changes={dirty ? changes.length : 0}
								blocked={saveBlocked}
								headNumber={head?.number ?? null}
							/>
						)
					}
					onChange={(next: (d: BuildDocument) => BuildDocument) => {
						setDraft(next);
						setSaveState((st) => ({ ...st, ok: null }));
					}}
				/>
			</ShelfContext.Provider>

			<RecentRevisions revisions={revisions.data} teamId={teamId} vehicleId={vehicleId} />
			<p className="sr-only">{vehicleName}</p>
		</div>
	);
}
