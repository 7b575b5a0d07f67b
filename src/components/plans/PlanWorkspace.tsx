import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useEffect, useMemo, useState } from 'react';
import { diffBuilds, type BuildDocument } from '@/engine/browser';
import { api, ApiError } from '@/lib/client/api-client';
import { getQueryClient } from '@/lib/client/query-client';
import { planDrafts } from '@/lib/client/draft-store';
import {
	fetchPlan,
	type PlanDto,
	useDeletePlan,
	useInstallPlan,
	useSavePlan,
} from '@/lib/client/queries/plans';
import {
	fieldName,
	formatFieldValue,
	formatMoney,
	GROUP_NAMES,
	type UnitSystem,
} from '@/lib/format';
import { planPartSchema } from '@/lib/schemas/plans';
import { Button, FormMessage } from '@/components/ui/Field';
import { Workbench } from '@/components/builds/Workbench';
import { validateDraft } from '@/lib/client/draft-check';
import { sameJson } from '@/lib/same-json';
import { installConfirmed } from '@/lib/client/install-plan';
import { useHydrated } from '@/lib/client/use-hydrated';
import { unpackJson } from '@/lib/packed-json';
import { ScrollRegion } from '@/components/ui/ScrollRegion';

export interface PlanWorkspaceProps {
	teamId: string;
	vehicleId: string;
	canEdit: boolean;
	currency: string;
	/** The plan without its document, which comes as JSON text beside it. */
	plan: Omit<PlanDto, 'document'>;
	/**
	 * The plan's document, packed (`packJson`): the page hands a document over as one string with
	 * nothing to escape. Null for a plan too large to come with the page: the island fetches it
	 * (and its base revision's) once live.
	 */
	documentPacked: string | null;
	/** How many parts the plan's document has (for the loading note of a large one). */
	documentParts?: number;
	/** The document of the revision the plan started from (packed), to show what the plan changes. */
	baseDocumentPacked: string | null;
	head: { id: string; number: number } | null;
	units: UnitSystem;
}

interface PlanWorkspaceViewProps extends Omit<
	PlanWorkspaceProps,
	'plan' | 'documentPacked' | 'baseDocumentPacked' | 'documentParts'
> {
	plan: PlanDto;
	baseDocument: BuildDocument | null;
}

/** The field check before the page is live (nothing checked yet). */
const NOT_CHECKED: Record<string, string> = {};
/** Changes listed before "show all". */
const CHANGES_SHOWN = 40;

export function PlanWorkspace(props: PlanWorkspaceProps) {
	return (
		<QueryClientProvider client={getQueryClient()}>
			{props.documentPacked === null ? (
				<LargePlan {...props} />
			) : (
				<PackedPlan {...props} documentPacked={props.documentPacked} />
			)}
		</QueryClientProvider>
	);
}

function PackedPlan({
	plan,
	documentPacked,
	baseDocumentPacked,
	documentParts: _parts,
	...rest
}: PlanWorkspaceProps & { documentPacked: string }) {
	const full = useMemo(
		() => ({ ...plan, document: unpackJson<BuildDocument>(documentPacked) }),
		[plan, documentPacked],
	);
	const baseDocument = useMemo(
		() => (baseDocumentPacked ? unpackJson<BuildDocument>(baseDocumentPacked) : null),
		[baseDocumentPacked],
	);
	return <PlanWorkspaceView {...rest} plan={full} baseDocument={baseDocument} />;
}

/** A plan too large to come with the page: its documents are fetched once the page is live. */
function LargePlan({
	plan,
	documentParts,
	baseDocumentPacked: _base,
	documentPacked: _packed,
	...rest
}: PlanWorkspaceProps) {
	const { teamId, vehicleId } = rest;
	const loaded = useQuery({
		queryKey: ['plan-documents', plan.id, plan.version],
		queryFn: async ({ signal }) => {
			const [full, base] = await Promise.all([
				api<PlanDto>(`/api/teams/${teamId}/vehicles/${vehicleId}/plans/${plan.id}`, { signal }),
				plan.baseRevisionId
					? api<{ document: BuildDocument }>(
							`/api/teams/${teamId}/vehicles/${vehicleId}/revisions/${plan.baseRevisionId}`,
							{ signal },
						)
					: null,
			]);
			return { full, baseDocument: base?.document ?? null };
		},
		staleTime: Infinity,
		retry: 1,
	});
	if (loaded.data)
		return (
			<PlanWorkspaceView
				{...rest}
				plan={loaded.data.full}
				baseDocument={loaded.data.baseDocument}
			/>
		);
	return (
		<div className="rounded-md border border-hairline bg-card p-4" aria-live="polite">
			{loaded.isError ? (
				<FormMessage tone="error">
					The plan could not be loaded ({loaded.error.message}).{' '}
					<button type="button" className="underline" onClick={() => void loaded.refetch()}>
						Try again
					</button>
				</FormMessage>
			) : (
				<p className="text-sm text-ink-soft" role="status">
					Loading the plan’s {documentParts?.toLocaleString('en') ?? ''} parts…
				</p>
			)}
		</div>
	);
}

/** A parts line as edited: numbers kept as typed so a half-typed price is not lost. */
interface PartDraft {
	item: string;
	quantity: string;
	unitPrice: string;
	link: string;
}

const toDraft = (p: PlanDto['parts'][number]): PartDraft => ({
	item: p.item,
	quantity: String(p.quantity),
	unitPrice: p.unitPrice.toFixed(2),
	link: p.link,
});
const fromDraft = (p: PartDraft) => ({
	item: p.item,
	quantity: Number(p.quantity),
	unitPrice: Number(p.unitPrice),
	link: p.link,
});

function PlanWorkspaceView({
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
	const [allChanges, setAllChanges] = useState(false);
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
					installPlan.mutateAsync({ planId: plan.id, parentId: head.id, acceptDangers }),
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
				<ScrollRegion
					label="Parts to buy"
					className="mt-3 rounded-md border border-hairline bg-card"
				>
					<table className="w-full text-sm">
						<caption className="sr-only">Parts list</caption>
						<thead className="bg-paper text-xs text-ink-soft">
							<tr>
								<th className="px-3 py-2 text-left">Item</th>
								<th className="w-24 px-3 py-2 text-right">Qty</th>
								<th className="w-32 px-3 py-2 text-right">Unit price</th>
								<th className="px-3 py-2 text-left">Link or reference</th>
								<th className="w-32 px-3 py-2 text-right">Line total</th>
								{canEdit && (
									<th className="w-10 px-3 py-2">
										<span className="sr-only">Remove</span>
									</th>
								)}
							</tr>
						</thead>
						<tbody>
							{parts.length === 0 && (
								<tr>
									<td colSpan={6} className="px-3 py-3 text-ink-soft">
										No parts listed yet.
									</td>
								</tr>
							)}
							{parts.map((p, i) => (
								<tr key={i} className="border-t border-hairline align-top">
									<PartCell
										label={`Item ${i + 1}`}
										value={p.item}
										error={errors[`parts.${i}.item`]}
										readOnly={!canEdit}
										onChange={(v) => setPart(i, { item: v })}
									/>
									<PartCell
										label={`Quantity ${i + 1}`}
										value={p.quantity}
										error={errors[`parts.${i}.quantity`]}
										readOnly={!canEdit}
										onChange={(v) => setPart(i, { quantity: v })}
										numeric
									/>
									<PartCell
										label={`Unit price ${i + 1}`}
										value={p.unitPrice}
										error={errors[`parts.${i}.unitPrice`]}
										readOnly={!canEdit}
										onChange={(v) => setPart(i, { unitPrice: v })}
										numeric
									/>
									<PartCell
										label={`Link ${i + 1}`}
										value={p.link}
										error={errors[`parts.${i}.link`]}
										readOnly={!canEdit}
										onChange={(v) => setPart(i, { link: v })}
									/>
									<td className="num px-3 py-2 text-right">
										{Number.isFinite(Number(p.quantity) * Number(p.unitPrice))
											? formatMoney(
													(Math.round(Number(p.unitPrice) * 100) * Number(p.quantity)) / 100,
													currency,
												)
											: '—'}
									</td>
									{canEdit && (
										<td className="px-2 py-1.5">
											<button
												type="button"
												onClick={() => setParts((ps) => ps.filter((_, j) => j !== i))}
												className="rounded px-2 py-1 text-ink-soft hover:bg-brick-tint hover:text-brick"
												aria-label={`Remove part ${i + 1}`}
											>
												✕
											</button>
										</td>
									)}
								</tr>
							))}
						</tbody>
						<tfoot>
							<tr className="border-t-2 border-hairline font-semibold">
								<td className="px-3 py-2" colSpan={4}>
									{canEdit && (
										<button
											type="button"
											onClick={() =>
												setParts((ps) => [
													...ps,
													{ item: '', quantity: '1', unitPrice: '0.00', link: '' },
												])
											}
											className="rounded-md border border-hairline bg-card px-2 py-0.5 text-sm font-normal hover:border-copper"
										>
											+ Add a part
										</button>
									)}
								</td>
								<td className="num px-3 py-2 text-right" data-testid="parts-total">
									{formatMoney(total, currency)}
								</td>
								{canEdit && <td />}
							</tr>
						</tfoot>
					</table>
				</ScrollRegion>
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

			<section aria-labelledby="changes-heading">
				<h2 id="changes-heading" className="text-xl font-bold">
					What the plan changes
				</h2>
				{changes === null ? (
					<p className="mt-2 text-sm text-ink-soft">Working out what the plan changes…</p>
				) : changes.length === 0 ? (
					<p className="mt-2 text-sm text-ink-soft">
						Nothing yet: the plan is the same as revision {plan.baseRevisionNumber}. Change it in
						the editor below.
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
		</div>
	);
}

function PartCell({
	label,
	value,
	error,
	readOnly,
	onChange,
	numeric,
}: {
	label: string;
	value: string;
	error?: string;
	readOnly: boolean;
	onChange: (v: string) => void;
	numeric?: boolean;
}) {
	return (
		<td className="px-2 py-1.5">
			<input
				aria-label={label}
				value={value}
				readOnly={readOnly}
				inputMode={numeric ? 'decimal' : undefined}
				onChange={(e) => onChange(e.target.value)}
				aria-invalid={error ? true : undefined}
				className={`w-full rounded border bg-card px-2 py-1 ${numeric ? 'num text-right' : ''} ${error ? 'border-brick' : 'border-hairline'}`}
			/>
			{error && (
				<p role="alert" className="mt-0.5 text-xs text-brick">
					{error}
				</p>
			)}
		</td>
	);
}
