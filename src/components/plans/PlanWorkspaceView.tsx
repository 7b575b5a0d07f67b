import { useEffect, useMemo, useState } from 'react';
import { diffBuilds, type BuildDocument } from '@/engine/browser';
import { ApiError } from '@/lib/client/api-client';

import { planDrafts } from '@/lib/client/draft-store';
import {
	fetchPlan,
	type PlanDto,
	useDeletePlan,
	useInstallPlan,
	useSavePlan,
} from '@/lib/client/queries/plans';
import { formatMoney } from '@/lib/format';
import { planPartSchema } from '@/lib/schemas/plans';
import { Button, FormMessage } from '@/components/ui/Field';
import { Workbench } from '@/components/builds/Workbench';
import { validateDraft } from '@/lib/client/draft-check';
import { sameJson } from '@/lib/same-json';
import { installConfirmed } from '@/lib/client/install-plan';
import { useHydrated } from '@/lib/client/use-hydrated';

import { PlanChanges } from './PlanChanges';
import { ShelfContext } from '@/components/builds/shelf-context';
import { RecordPurchasesChoice } from './RecordPurchasesChoice';
import { fromDraft, useShelfPicks, type PartDraft, PlanPartsTable, toDraft } from './plan-parts';
import type { PlanWorkspaceProps } from './PlanWorkspace';

export interface PlanWorkspaceViewProps extends Omit<
	PlanWorkspaceProps,
	'plan' | 'documentPacked' | 'baseDocumentPacked' | 'documentParts'
> {
	plan: PlanDto;
	baseDocument: BuildDocument | null;
}

/** The field check before the page is live (nothing checked yet). */
const NOT_CHECKED: Record<string, string> = {};

export function PlanWorkspaceView({
	teamId,
	vehicleId,
	canEdit,
	currency,
	plan: initialPlan,
	baseDocument,
	head,
	units,
}: PlanWorkspaceViewProps) {
	const savePlan = useSavePlan(teamId, vehicleId, initialPlan.id);
	const installPlan = useInstallPlan(teamId, vehicleId);
	const deletePlan = useDeletePlan(teamId, vehicleId);
	const [plan, setPlan] = useState(initialPlan);
	const [name, setName] = useState(plan.name);
	const [notes, setNotes] = useState(plan.notes);
	const [draft, setDraft] = useState<BuildDocument>(plan.document);
	const [parts, setParts] = useState<PartDraft[]>(plan.parts.map(toDraft));
	const [state, setState] = useState<{
		busy: 'save' | 'install' | 'delete' | null;
		error: string | null;
		ok: string | null;
		serverErrors: Record<string, string>;
	}>({ busy: null, error: null, ok: null, serverErrors: {} });

	// The field check and the changes are worked out once the page is live: a plan at the limits
	// (a thousand cables) must not hold the server's request thread while its page is rendered.
	const hydrated = useHydrated();
	const docErrors = useMemo(
		() => (hydrated ? validateDraft(draft) : NOT_CHECKED),
		[draft, hydrated],
	);
	const partErrors = useMemo(() => {
		const out: Record<string, string> = {};
		parts.forEach((p, i) => {
			const r = planPartSchema.safeParse(fromDraft(p));
			if (!r.success)
				for (const issue of r.error.issues)
					out[`parts.${i}.${issue.path.join('.')}`] ??= issue.message;
		});
		return out;
	}, [parts]);
	const errors = { ...state.serverErrors, ...partErrors };
	const valid =
		Object.keys(docErrors).length === 0 &&
		Object.keys(partErrors).length === 0 &&
		name.trim() !== '';
	const saved = {
		name: plan.name,
		notes: plan.notes,
		document: plan.document,
		parts: plan.parts.map(toDraft),
	};
	// Nothing is changed before the page is live (and comparing a large plan costs the render).
	const dirty = hydrated && !sameJson({ name, notes, document: draft, parts }, saved);
	const changes = useMemo(
		() => (!hydrated ? null : baseDocument ? diffBuilds(baseDocument, draft) : []),
		[baseDocument, draft, hydrated],
	);
	const total =
		parts.reduce(
			(s, p) =>
				s +
				(Number.isFinite(Number(p.quantity)) && Number.isFinite(Number(p.unitPrice))
					? Math.round(Number(p.unitPrice) * 100) * Number(p.quantity)
					: 0),
			0,
		) / 100;

	// Unsaved edits live in this browser until saved, so a reload or a crash loses nothing.
	const [restored, setRestored] = useState<string | null>(null);
	const [baseVersion, setBaseVersion] = useState(plan.version);
	useEffect(() => {
		if (!canEdit) return;
		const stored = planDrafts.load(plan.id);
		if (!stored) return;
		if (
			sameJson(
				{
					name: stored.name,
					notes: stored.notes,
					document: stored.document,
					parts: stored.parts,
				},
				saved,
			)
		)
			return planDrafts.clear(plan.id);
		setName(stored.name);
		setNotes(stored.notes);
		setDraft(stored.document);
		setParts(stored.parts);
		setBaseVersion(stored.version);
		setRestored(
			stored.version === plan.version
				? 'Your unsaved changes to this plan from this browser are back.'
				: 'Your unsaved changes are back, but someone saved the plan since; saving will ask before replacing theirs.',
		);
		// eslint-disable-next-line react-hooks/exhaustive-deps -- once, on mount: what changes later is the member's own editing
	}, []);
	useEffect(() => {
		if (canEdit && dirty)
			planDrafts.store(plan.id, { version: baseVersion, name, notes, document: draft, parts });
	}, [canEdit, dirty, plan.id, baseVersion, name, notes, draft, parts]);

	// Warn before leaving with unsaved changes.
	useEffect(() => {
		if (!dirty) return;
		const warn = (e: BeforeUnloadEvent) => e.preventDefault();
		window.addEventListener('beforeunload', warn);
		return () => window.removeEventListener('beforeunload', warn);
	}, [dirty]);

	async function save(version = baseVersion) {
		setState({ busy: 'save', error: null, ok: null, serverErrors: {} });
		try {
			const next = await savePlan.mutateAsync({
				version,
				name,
				notes,
				document: draft,
				parts: parts.map(fromDraft),
			});
			planDrafts.clear(plan.id);
			setRestored(null);
			setBaseVersion(next.version);
			setPlan(next);
			// What the server kept is now the draft too, so nothing reads as unsaved after saving.
			setName(next.name);
			setNotes(next.notes);
			setDraft(next.document);
			setParts(next.parts.map(toDraft));
			setState({ busy: null, error: null, ok: 'Plan saved.', serverErrors: {} });
			return true;
		} catch (e) {
			if (e instanceof ApiError && e.status === 409) {
				// Someone saved the plan meanwhile: keep ours, offer to save it on top.
				const current = await fetchPlan(teamId, vehicleId, plan.id);
				setState({ busy: null, error: `${e.message}`, ok: null, serverErrors: {} });
				if (
					window.confirm(
						'Someone else saved this plan while you edited. Save your version on top of theirs?',
					)
				)
					return save(current.version);
				return false;
			}
			setState({
				busy: null,
				error:
					e instanceof ApiError
						? e.message
						: 'Could not reach the server; your changes are still here.',
				ok: null,
				serverErrors: e instanceof ApiError ? e.byField() : {},
			});
			return false;
		}
	}

	async function install() {
		if (!head) return;
		if (!window.confirm(`Install “${plan.name}” as revision ${head.number + 1} of the build?`))
			return;
		if (dirty && !(await save())) return;
		setState((s) => ({ ...s, busy: 'install', error: null, ok: null }));
		try {
			// A danger finding the plan brings is named by the server and asked about before saving.
			const revision = await installConfirmed(
				(acceptDangers) =>
					installPlan.mutateAsync({
						planId: plan.id,
						parentId: head.id,
						acceptDangers,
						recordPurchasesIn: recordIn,
					}),
				plan.name,
				[],
			);
			if (!revision) {
				setState((s) => ({ ...s, busy: null, error: 'Not installed.' }));
				return;
			}
			window.location.assign(`/teams/${teamId}/vehicles/${vehicleId}/history#r${revision.number}`);
		} catch (e) {
			setState((s) => ({
				...s,
				busy: null,
				error:
					e instanceof ApiError ? e.message : 'Could not reach the server; nothing was installed.',
			}));
		}
	}

	async function remove() {
		if (
			!window.confirm(
				`Delete the plan “${plan.name}” and its parts list? The build is not touched.`,
			)
		)
			return;
		setState((s) => ({ ...s, busy: 'delete', error: null }));
		try {
			await deletePlan.mutateAsync(plan.id);
			window.location.assign(`/teams/${teamId}/vehicles/${vehicleId}/plans`);
		} catch (e) {
			setState((s) => ({
				...s,
				busy: null,
				error: e instanceof ApiError ? e.message : 'Could not reach the server.',
			}));
		}
	}

	const shelf = useShelfPicks(teamId, setParts);
	const [recordIn, setRecordIn] = useState<string | null>(null);
	const setPart = (i: number, patch: Partial<PartDraft>) =>
		setParts((ps) => ps.map((p, j) => (j === i ? { ...p, ...patch } : p)));

	return (
		<div className="flex flex-col gap-8">
			<section
				aria-label="Plan and saving"
				className="-mx-2 flex flex-col gap-2 rounded-md border border-hairline bg-card/95 p-3 shadow-sm backdrop-blur"
			>
				<div className="flex flex-wrap items-center gap-3">
					<label htmlFor="plan-name" className="sr-only">
						Plan name
					</label>
					<input
						id="plan-name"
						value={name}
						onChange={(e) => setName(e.target.value)}
						readOnly={!canEdit}
						maxLength={120}
						className="min-w-64 flex-1 rounded-md border border-hairline bg-card px-3 py-2 text-lg font-semibold"
						aria-invalid={name.trim() === '' || undefined}
					/>
					<span className="text-sm text-ink-soft">
						from revision {plan.baseRevisionNumber ?? '—'} ·{' '}
						{changes === null
							? 'changes being worked out'
							: `${changes.length} change${changes.length === 1 ? '' : 's'}`}{' '}
						· parts {formatMoney(total, currency)}
					</span>
					{dirty && (
						<span className="rounded bg-amber-tint px-2 py-0.5 text-xs font-semibold">
							● unsaved
						</span>
					)}
					{Object.keys(docErrors).length + Object.keys(partErrors).length > 0 && (
						<span className="rounded bg-brick-tint px-2 py-0.5 text-xs font-semibold text-brick">
							✕ {Object.keys(docErrors).length + Object.keys(partErrors).length} to fix
						</span>
					)}
					{plan.installedRevisionNumber && (
						<span className="rounded bg-teal-tint px-2 py-0.5 text-xs font-semibold text-teal">
							✓ installed as r{plan.installedRevisionNumber}
						</span>
					)}
				</div>
				{canEdit && (
					<div className="flex flex-wrap gap-2">
						<Button
							onClick={() => void save()}
							busy={state.busy === 'save'}
							disabled={!dirty || !valid || state.busy !== null}
						>
							Save plan
						</Button>
						<Button
							variant="secondary"
							onClick={() => void install()}
							busy={state.busy === 'install'}
							disabled={!valid || !head || state.busy !== null}
						>
							Install as next revision
						</Button>
						<RecordPurchasesChoice
							teamId={teamId}
							totalMinor={Math.round(total * 100)}
							value={recordIn}
							onChange={setRecordIn}
						/>
						<a
							href={`/teams/${teamId}/vehicles/${vehicleId}/plans?compare=${plan.id}`}
							className="rounded-md border border-hairline bg-card px-4 py-2 font-semibold hover:border-copper"
						>
							Compare
						</a>
						<span className="flex-1" />
						<Button
							variant="danger"
							onClick={() => void remove()}
							busy={state.busy === 'delete'}
							disabled={state.busy !== null}
						>
							Delete plan
						</Button>
					</div>
				)}
				{restored && <FormMessage tone="info">{restored}</FormMessage>}
				{state.ok && <FormMessage tone="ok">{state.ok}</FormMessage>}
				{state.error && <FormMessage tone="error">{state.error}</FormMessage>}
			</section>

			<section aria-labelledby="parts-heading">
				<h2 id="parts-heading" className="text-xl font-bold">
					Parts list
				</h2>
				<p className="text-sm text-ink-soft">
					Prices per unit in {currency}. The link is kept as text (a catalogue page, a shop's part
					number).
				</p>
				<PlanPartsTable
					parts={parts}
					errors={errors}
					canEdit={canEdit}
					currency={currency}
					total={total}
					onChange={setPart}
					onRemove={(i) => setParts((ps) => ps.filter((_, j) => j !== i))}
					onAdd={() =>
						setParts((ps) => [...ps, { item: '', quantity: '1', unitPrice: '0.00', link: '' }])
					}
				/>
				<div className="mt-3 flex flex-col gap-1">
					<label htmlFor="plan-notes" className="text-sm font-semibold">
						Notes
					</label>
					<textarea
						id="plan-notes"
						value={notes}
						onChange={(e) => setNotes(e.target.value)}
						readOnly={!canEdit}
						rows={2}
						maxLength={2000}
						className="rounded-md border border-hairline bg-card px-3 py-2 text-sm"
					/>
				</div>
			</section>

			<PlanChanges changes={changes} baseRevisionNumber={plan.baseRevisionNumber} units={units} />

			<ShelfContext.Provider value={shelf}>
				<Workbench
					draft={draft}
					errors={docErrors}
					checking={!hydrated}
					units={units}
					canEdit={canEdit}
					subject="plan"
					baseline={baseDocument}
					onChange={(next) => setDraft(next)}
					// A plan's figures are worked out in the browser, never on the server's request thread.
					computeOnServer={false}
				/>
			</ShelfContext.Provider>
		</div>
	);
}
