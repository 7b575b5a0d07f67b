import { QueryClientProvider, useQuery, useQueryClient } from '@tanstack/react-query';
import { formatDistanceToNow } from 'date-fns';
import { useDeferredValue, useEffect, useMemo, useState } from 'react';
import { diffBuilds } from '@/engine/diff';
import { buildReport, DEFAULT_SCENARIO, type ReportWarning } from '@/engine/report';
import { runBurp } from '@/engine/burp';
import { upgradeHints } from '@/engine/hints';
import type { BuildDocument, Scenario } from '@/engine/types';
import { buildDocumentSchema, parseBuildDocument } from '@/lib/schemas/build-document';
import { checkTopology } from '@/engine/topology';
import { ApiError, postJson, sendJson } from '@/lib/client/api-client';
import { getQueryClient } from '@/lib/client/query-client';
import { buildKeys, type RevisionDto, type RevisionSummary, revisionsQueryOptions } from '@/lib/client/queries/builds';
import { fieldName, fmt, formatFieldValue, GROUP_NAMES, lengthUnit, toLengthDisplay, type UnitSystem } from '@/lib/format';
import { Button, FormMessage } from '../ui/Field';
import { BudgetChart, BurpChart } from './Charts';
import { clearDraft, loadDraft, storeDraft } from './draft-store';
import { alternatorColumns, amplifierColumns, bankColumns, cableColumns, loadColumns, nodeColumns } from './editor-columns';
import { NetworkDiagram } from './NetworkDiagram';
import { newAlternator, newAmplifier, newBank, newCable, newLoad, newNode, starterDocument } from './new-parts';
import { PartTable } from './PartTable';

export interface BuildWorkspaceProps {
	teamId: string;
	vehicleId: string;
	vehicleName: string;
	canEdit: boolean;
	head: RevisionDto | null;
	revisions: RevisionSummary[];
	units: UnitSystem;
}

export function BuildWorkspace(props: BuildWorkspaceProps) {
	return (
		<QueryClientProvider client={getQueryClient()}>
			<BuildWorkspaceView {...props} />
		</QueryClientProvider>
	);
}

type Group = 'nodes' | 'cables' | 'banks' | 'alternators' | 'amplifiers' | 'loads';

function validate(doc: BuildDocument): Record<string, string> {
	const parsed = buildDocumentSchema.safeParse(doc);
	const errors: Record<string, string> = {};
	if (!parsed.success) {
		for (const i of parsed.error.issues) errors[i.path.map(String).join('.')] ??= i.message;
		return errors;
	}
	for (const i of checkTopology(parsed.data)) errors[i.path] ??= i.message;
	return errors;
}

const SAFETY_LINE = 'These figures are estimates. Local codes, event rules and licensed practice govern high-current work.';

export function BuildWorkspaceView({ teamId, vehicleId, vehicleName, canEdit, head: initialHead, revisions: initialRevisions, units: initialUnits }: BuildWorkspaceProps) {
	const qc = useQueryClient();
	const [head, setHead] = useState<RevisionDto | null>(initialHead);
	const baseDoc = head?.document ?? starterDocument();
	const [draft, setDraft] = useState<BuildDocument>(baseDoc);
	const [baseId, setBaseId] = useState<string | null>(head?.id ?? null);
	const [message, setMessage] = useState('');
	const [restored, setRestored] = useState<string | null>(null);
	const [units, setUnits] = useState<UnitSystem>(initialUnits);
	const [scenario, setScenario] = useState<Scenario>(DEFAULT_SCENARIO);
	const [saveState, setSaveState] = useState<{ busy: boolean; error: string | null; ok: string | null; conflict: RevisionDto | null }>({ busy: false, error: null, ok: null, conflict: null });
	const revisions = useQuery({ ...revisionsQueryOptions(teamId, vehicleId), initialData: initialRevisions });

	// Bring back an unsaved draft from this browser.
	useEffect(() => {
		if (!canEdit) return;
		const stored = loadDraft(vehicleId);
		if (stored && JSON.stringify(stored.document) !== JSON.stringify(baseDoc)) {
			setDraft(stored.document);
			setMessage(stored.message);
			setBaseId(stored.baseRevisionId);
			setRestored(stored.baseRevisionId === (initialHead?.id ?? null) ? 'Your unsaved changes from this browser are back.' : 'Your unsaved changes are back, but they were based on an older revision; saving will ask you to compare.');
		}
		// eslint-disable-next-line react-hooks/exhaustive-deps
	}, []);

	const dirty = JSON.stringify(draft) !== JSON.stringify(baseDoc) || baseId !== (head?.id ?? null);
	useEffect(() => {
		if (canEdit && dirty) storeDraft(vehicleId, { baseRevisionId: baseId, document: draft, message });
	}, [canEdit, dirty, vehicleId, baseId, draft, message]);

	const errors = useMemo(() => validate(draft), [draft]);
	const valid = Object.keys(errors).length === 0;
	const report = useMemo(() => (valid ? buildReport(draft, scenario, { burpRun: false }) : null), [draft, scenario, valid]);
	const deferredDraft = useDeferredValue(draft);
	const burp = useMemo(() => {
		if (Object.keys(validate(deferredDraft)).length) return null;
		return runBurp(deferredDraft, { engineRpm: scenario.engineRpm, demand: scenario.burpDemand, conductorTempC: scenario.conductorTempC, durationS: scenario.burpSeconds, stepS: scenario.burpStepS });
	}, [deferredDraft, scenario]);
	const changes = useMemo(() => (head ? diffBuilds(head.document, draft) : []), [head, draft]);
	const hints = useMemo(() => {
		if (Object.keys(validate(deferredDraft)).length) return null;
		return upgradeHints(deferredDraft, { engineRpm: scenario.engineRpm, demand: scenario.burpDemand, conductorTempC: scenario.conductorTempC }).slice(0, 5);
	}, [deferredDraft, scenario]);

	const ok = report && report.ok ? report : null;
	const warningsFor = (kind: string, id: string) => (ok ? ok.warnings.filter((w) => w.element.kind === kind && w.element.id === id) : []);
	const flagged = useMemo(() => new Set(ok ? ok.warnings.filter((w) => w.element.kind === 'cable' && w.severity !== 'info').map((w) => w.element.id) : []), [ok]);
	const nodeOptions = draft.nodes.map((n) => ({ value: n.id, label: n.label || n.id }));

	function update<G extends Group>(group: G, index: number, next: BuildDocument[G][number]) {
		setDraft((d) => ({ ...d, [group]: d[group].map((x, i) => (i === index ? next : x)) }));
		setSaveState((s) => ({ ...s, ok: null }));
	}
	function add<G extends Group>(group: G, make: (d: BuildDocument) => BuildDocument[G][number]) {
		setDraft((d) => ({ ...d, [group]: [...d[group], make(d)] }));
	}
	function remove(group: Group, index: number) {
		setDraft((d) => ({ ...d, [group]: d[group].filter((_, i) => i !== index) }));
	}

	async function save(parentId: string | null) {
		setSaveState({ busy: true, error: null, ok: null, conflict: null });
		try {
			const saved = await postJson<RevisionDto>(`/api/teams/${teamId}/vehicles/${vehicleId}/revisions`, { parentId, message, document: draft });
			clearDraft(vehicleId);
			setHead(saved);
			setBaseId(saved.id);
			setDraft(saved.document);
			setMessage('');
			setRestored(null);
			setSaveState({ busy: false, error: null, ok: `Saved as revision ${saved.number}.`, conflict: null });
			await qc.invalidateQueries({ queryKey: buildKeys.revisions(vehicleId) });
		} catch (e) {
			if (e instanceof ApiError && e.status === 409) {
				const res = await fetch(`/api/teams/${teamId}/vehicles/${vehicleId}`);
				const vehicle = (await res.json()) as { headRevisionId: string };
				const theirs = await (await fetch(`/api/teams/${teamId}/vehicles/${vehicleId}/revisions/${vehicle.headRevisionId}`)).json();
				setSaveState({ busy: false, error: e.message, ok: null, conflict: theirs as RevisionDto });
			} else {
				setSaveState({ busy: false, error: e instanceof ApiError ? e.message : 'Could not reach the server; your draft is kept in this browser.', ok: null, conflict: null });
			}
		}
	}

	async function saveUnits(next: UnitSystem) {
		setUnits(next);
		await sendJson('/api/account/preferences', 'PATCH', { unitSystem: next }).catch(() => undefined);
	}

	const set = <K extends keyof Scenario>(key: K, value: Scenario[K]) => setScenario((s) => ({ ...s, [key]: value }));
	const lu = lengthUnit(units);

	return (
		<div className="flex flex-col gap-8">
			{/* Status and save */}
			<section aria-label="Draft and saving" className="sticky top-0 z-10 -mx-2 flex flex-col gap-2 rounded-md border border-hairline bg-card/95 p-3 shadow-sm backdrop-blur">
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
					{dirty && <span className="rounded bg-amber-tint px-2 py-0.5 text-xs font-semibold text-ink">● {changes.length} unsaved change{changes.length === 1 ? '' : 's'}</span>}
					{!valid && <span className="rounded bg-brick-tint px-2 py-0.5 text-xs font-semibold text-brick">✕ {Object.keys(errors).length} field{Object.keys(errors).length === 1 ? '' : 's'} to fix</span>}
					<span className="flex-1" />
					<fieldset className="flex items-center gap-1 text-sm">
						<legend className="sr-only">Units</legend>
						{(['imperial', 'metric'] as const).map((u) => (
							<label key={u} className={`cursor-pointer rounded px-2 py-1 ${units === u ? 'bg-slate-deep text-paper' : 'bg-paper'}`}>
								<input type="radio" name="units" className="sr-only" checked={units === u} onChange={() => void saveUnits(u)} />
								{u === 'imperial' ? 'ft · AWG' : 'm · mm²'}
							</label>
						))}
					</fieldset>
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
						<input id="revision-message" value={message} onChange={(e) => setMessage(e.target.value)} placeholder="What changed and why (e.g. run upgraded to 1/0 after the last event)" className="min-w-72 flex-1 rounded-md border border-hairline bg-card px-3 py-2" maxLength={500} />
						<Button type="submit" busy={saveState.busy} disabled={!dirty || !valid || message.trim() === ''}>
							Save revision
						</Button>
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
										return setSaveState((s) => ({ ...s, error: `${f.name} is not valid JSON.`, ok: null }));
									}
									const parsed = parseBuildDocument(raw);
									if (!parsed.ok) {
										return setSaveState((s) => ({ ...s, ok: null, error: `${f.name} was not loaded: ${parsed.problems.slice(0, 4).map((p) => `${p.path || 'document'}: ${p.message}`).join(' · ')}` }));
									}
									setDraft(parsed.doc);
									setSaveState((s) => ({ ...s, error: null, ok: `${f.name} is loaded into the draft; save it as a revision to keep it.` }));
								}}
							/>
						</label>
						{dirty && (
							<Button
								type="button"
								variant="secondary"
								onClick={() => {
									if (!window.confirm('Throw away the unsaved changes?')) return;
									clearDraft(vehicleId);
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
				{restored && <FormMessage tone="info">{restored}</FormMessage>}
				{saveState.ok && <FormMessage tone="ok">{saveState.ok} <a className="font-semibold underline" href={`/teams/${teamId}/vehicles/${vehicleId}/history`}>See the history</a></FormMessage>}
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
							clearDraft(vehicleId);
							setHead(saveState.conflict);
							setBaseId(saveState.conflict!.id);
							setDraft(saveState.conflict!.document);
							setSaveState({ busy: false, error: null, ok: null, conflict: null });
						}}
					/>
				)}
			</section>

			{/* Scenario */}
			<section aria-labelledby="scenario-heading">
				<h2 id="scenario-heading" className="text-xl font-bold">Conditions</h2>
				<div className="mt-3 grid gap-3 rounded-md border border-hairline bg-card p-4 sm:grid-cols-3 lg:grid-cols-6">
					<ScenarioNumber label="Engine speed" unit="rpm" value={scenario.engineRpm} onChange={(v) => set('engineRpm', v)} min={0} max={8000} step={100} />
					<ScenarioNumber label="Music level" unit="% of rated" value={scenario.sustainedDemand * 100} onChange={(v) => set('sustainedDemand', v / 100)} min={1} max={100} step={1} />
					<ScenarioNumber label="Burp level" unit="% of rated" value={scenario.burpDemand * 100} onChange={(v) => set('burpDemand', v / 100)} min={1} max={150} step={5} />
					<ScenarioNumber label="Cable temperature" unit="°C" value={scenario.conductorTempC} onChange={(v) => set('conductorTempC', v)} min={-20} max={120} step={5} />
					<ScenarioNumber label="Drop target" unit="V" value={scenario.dropTargetV} onChange={(v) => set('dropTargetV', v)} min={0.05} max={3} step={0.05} />
					<div className="flex flex-col gap-1 text-sm">
						<label htmlFor="voltages" className="font-semibold">Supply voltages (V)</label>
						<input
							id="voltages"
							defaultValue={scenario.voltagesV.join(', ')}
							onBlur={(e) => {
								const vs = e.target.value.split(/[,\s]+/).map(Number).filter((x) => Number.isFinite(x) && x >= 6 && x <= 20);
								if (vs.length) set('voltagesV', vs);
							}}
							className="num rounded-md border border-hairline px-2 py-1"
						/>
					</div>
				</div>
			</section>

			{!valid && (
				<FormMessage tone="error">
					The build cannot be computed until the marked fields are fixed. {Object.entries(errors).slice(0, 3).map(([p, m]) => `${p}: ${m}`).join(' · ')}
				</FormMessage>
			)}

			{ok && <Readouts report={ok} />}
			{ok && <Findings warnings={ok.warnings} />}

			<section aria-labelledby="diagram-heading">
				<h2 id="diagram-heading" className="text-xl font-bold">The network</h2>
				<div className="mt-3">
					<NetworkDiagram doc={draft} flagged={flagged} />
				</div>
				<p className="mt-1 text-xs text-ink-soft">Copper: supply side. Slate: ground side. Dashed red: a cable with a finding. Dashed links: banks, alternators, amplifiers and loads between their terminals.</p>
			</section>

			{ok && (
				<section aria-labelledby="budget-heading" className="grid gap-6 lg:grid-cols-2">
					<div>
						<h2 id="budget-heading" className="text-xl font-bold">Demand and supply at fixed voltages</h2>
						<div className="mt-3 rounded-md border border-hairline bg-card p-3">
							<BudgetChart rows={ok.budget} />
						</div>
					</div>
					<div className="overflow-x-auto">
						<table className="mt-10 w-full rounded-md border border-hairline bg-card text-sm">
							<caption className="sr-only">Budget at each supply voltage</caption>
							<thead className="bg-paper text-xs text-ink-soft">
								<tr>
									<th className="px-3 py-2 text-left">Supply</th>
									<th className="px-3 py-2 text-right">Music</th>
									<th className="px-3 py-2 text-right">Burp</th>
									<th className="px-3 py-2 text-right">Alternators</th>
									<th className="px-3 py-2 text-right">Music surplus</th>
									<th className="px-3 py-2 text-right">Banks carry the burp for</th>
								</tr>
							</thead>
							<tbody className="num">
								{ok.budget.map((r) => (
									<tr key={r.voltageV} className="border-t border-hairline">
										<td className="px-3 py-1.5">{fmt(r.voltageV, 1)} <Unit>V</Unit></td>
										<td className="px-3 py-1.5 text-right">{fmt(r.sustainedDemandA, 0)} <Unit>A</Unit></td>
										<td className="px-3 py-1.5 text-right">{fmt(r.burpDemandA, 0)} <Unit>A</Unit></td>
										<td className="px-3 py-1.5 text-right text-teal">{fmt(r.alternatorSupplyA, 0)} <Unit>A</Unit></td>
										<td className={`px-3 py-1.5 text-right ${r.sustainedSurplusA < 0 ? 'text-amber' : 'text-teal'}`}>
											{r.sustainedSurplusA < 0 ? '▼ ' : '▲ '}
											{fmt(r.sustainedSurplusA, 0)} <Unit>A</Unit>
										</td>
										<td className="px-3 py-1.5 text-right">{r.burpCarrySeconds === null ? 'no deficit' : r.burpCarrySeconds > 3600 ? `${fmt(r.burpCarrySeconds / 3600, 1)} h` : `${fmt(r.burpCarrySeconds / 60, 0)} min`}</td>
									</tr>
								))}
							</tbody>
						</table>
					</div>
				</section>
			)}

			{ok && (
				<section aria-labelledby="amps-heading">
					<h2 id="amps-heading" className="text-xl font-bold">Amplifiers under the burp</h2>
					<div className="mt-3 overflow-x-auto rounded-md border border-hairline bg-card">
						<table className="w-full text-sm">
							<thead className="bg-paper text-xs text-ink-soft">
								<tr>
									<th className="px-3 py-2 text-left">Amplifier</th>
									<th className="px-3 py-2 text-right">Terminals, music</th>
									<th className="px-3 py-2 text-right">Terminals, burp</th>
									<th className="px-3 py-2 text-right">Lost to wiring</th>
									<th className="px-3 py-2 text-right">Current</th>
									<th className="px-3 py-2 text-right">Output</th>
									<th className="px-3 py-2 text-right">vs rating</th>
									<th className="px-3 py-2 text-right">Lowest in a {scenario.burpSeconds} s burp</th>
								</tr>
							</thead>
							<tbody className="num">
								{ok.amplifiers.map((a) => (
									<tr key={a.id} className="border-t border-hairline">
										<td className="px-3 py-1.5 font-sans font-semibold">{a.label}</td>
										<td className="px-3 py-1.5 text-right">{fmt(a.sustainedTerminalV)} <Unit>V</Unit></td>
										<td className="px-3 py-1.5 text-right">{fmt(a.burpTerminalV)} <Unit>V</Unit></td>
										<td className={`px-3 py-1.5 text-right ${a.burpDropV > scenario.dropTargetV ? 'text-amber' : ''}`}>{a.burpDropV > scenario.dropTargetV ? '⚠ ' : ''}{fmt(a.burpDropV)} <Unit>V</Unit></td>
										<td className="px-3 py-1.5 text-right">{fmt(a.burpCurrentA, 0)} <Unit>A</Unit></td>
										<td className="px-3 py-1.5 text-right">{fmt(a.burpOutputW, 0)} <Unit>W</Unit></td>
										<td className="px-3 py-1.5 text-right">{fmt(a.burpOutputLossDb)} <Unit>dB</Unit></td>
										<td className="px-3 py-1.5 text-right">{burp ? `${fmt(burp.amplifierMinV[a.id])}` : '…'} <Unit>V</Unit></td>
									</tr>
								))}
							</tbody>
						</table>
					</div>
				</section>
			)}

			{ok && (
				<section aria-labelledby="cables-heading">
					<h2 id="cables-heading" className="text-xl font-bold">Cables: current, drop and protection</h2>
					<div className="mt-3 overflow-x-auto rounded-md border border-hairline bg-card">
						<table className="w-full text-sm" aria-label="Cable checks">
							<thead className="bg-paper text-xs text-ink-soft">
								<tr>
									<th className="px-3 py-2 text-left">Cable</th>
									<th className="px-3 py-2 text-right">Burp current</th>
									<th className="px-3 py-2 text-right">Drop</th>
									<th className="px-3 py-2 text-right">Loss</th>
									<th className="px-3 py-2 text-right">cmil/A (rule)</th>
									<th className="px-3 py-2 text-right">Carries</th>
									<th className="px-3 py-2 text-left">Fuse advice</th>
									<th className="px-3 py-2 text-left">Checks</th>
								</tr>
							</thead>
							<tbody>
								{ok.cables.map((c) => {
									const ws = warningsFor('cable', c.id);
									return (
										<tr key={c.id} className="border-t border-hairline align-top" data-cable-row={c.id}>
											<td className="px-3 py-1.5 font-semibold">{c.label}</td>
											<td className="num px-3 py-1.5 text-right">{fmt(Math.abs(c.burp.currentA), 0)} <Unit>A</Unit></td>
											<td className="num px-3 py-1.5 text-right" data-testid={`drop-${c.id}`}>{fmt(Math.abs(c.burp.dropV), 3)} <Unit>V</Unit></td>
											<td className="num px-3 py-1.5 text-right">{fmt(c.burp.lossW, 0)} <Unit>W</Unit></td>
											<td className={`num px-3 py-1.5 text-right ${c.cmilPerAmp < c.requiredCmilPerAmp ? 'text-amber' : ''}`}>
												{Number.isFinite(c.cmilPerAmp) ? fmt(c.cmilPerAmp, 0) : '—'} <Unit>({fmt(c.requiredCmilPerAmp, 0)})</Unit>
											</td>
											<td className="num px-3 py-1.5 text-right">{c.ampacity ? `${fmt(c.ampacity.currentA, 0)}` : '—'} <Unit>A</Unit></td>
											<td className="px-3 py-1.5">
												{c.fuseAdvice === null ? <span className="text-ink-soft">ground side</span> : c.fuseAdvice.status === 'ok' ? `${c.fuseAdvice.recommendedA} A (max ${fmt(c.fuseAdvice.maxA, 0)} A)` : c.fuseAdvice.status === 'cable_too_small' ? <span className="text-brick">✕ cable too small</span> : 'capacity unknown'}
											</td>
											<td className="px-3 py-1.5">
												{ws.length === 0 ? <span className="text-teal">✓ ok</span> : <WarningList warnings={ws} />}
											</td>
										</tr>
									);
								})}
							</tbody>
						</table>
					</div>
					<p className="mt-1 text-xs text-ink-soft">
						Capacity from 33 CFR 183.425 Table 5 by insulation rating at 30 °C, no bundling derate; fuse up to 150 % of it (33 CFR 183.455). 300 cmil/A for copper is common practice, scaled for other metals. Lengths in {lu}: {ok.cables.length} cables,{' '}
						{fmt(draft.cables.reduce((s, c) => s + toLengthDisplay(c.lengthM, units), 0), 1)} {lu} in all.
					</p>
				</section>
			)}

			{ok && (
				<section aria-labelledby="burp-heading">
					<h2 id="burp-heading" className="text-xl font-bold">A {scenario.burpSeconds} s burp, step by step</h2>
					<div className="mt-3 rounded-md border border-hairline bg-card p-3">
						{burp ? (
							<>
								<BurpChart run={burp} bankLabels={Object.fromEntries(draft.banks.map((b) => [b.id, b.label]))} ruleV={ok.amplifiers.length ? Math.max(...ok.banks.map((b) => b.ocvV), 0) - scenario.dropTargetV : null} />
								<p className="num mt-2 text-sm">
									Energy: {fmt(burp.energyWh.amplifiers, 1)} Wh into the amplifiers, {fmt(burp.energyWh.banks, 1)} Wh from the banks, {fmt(burp.energyWh.alternators, 1)} Wh from the alternators, {fmt(burp.energyWh.cableLoss, 1)} Wh lost in cables.
									{burp.collapsedAtS !== null && <span className="text-brick"> ✕ Voltage collapses after {fmt(burp.collapsedAtS, 2)} s.</span>}
								</p>
							</>
						) : (
							<p role="status" className="text-sm text-ink-soft">Computing the burp…</p>
						)}
					</div>
				</section>
			)}

			{ok && (
				<section aria-labelledby="hints-heading">
					<h2 id="hints-heading" className="text-xl font-bold">Where the volts go: single upgrades ranked</h2>
					<p className="text-sm text-ink-soft">Each line is one change, solved on its own, ranked by the voltage it gives back at the weakest amplifier under the burp.</p>
					{hints === null ? (
						<p role="status" className="mt-2 text-sm text-ink-soft">Ranking upgrades…</p>
					) : hints.length === 0 ? (
						<p className="mt-2 text-sm text-ink-soft">No amplifier to rank upgrades for.</p>
					) : (
						<ol className="mt-3 divide-y divide-hairline rounded-md border border-hairline bg-card text-sm">
							{hints.map((h, i) => (
								<li key={`${h.kind}-${h.targetId}`} className="flex flex-wrap items-center gap-3 px-4 py-2">
									<span className="num w-6 text-ink-soft">{i + 1}.</span>
									<span className="flex-1">{h.description}</span>
									<span className={`num font-semibold ${h.gainV > 0.005 ? 'text-teal' : 'text-ink-soft'}`}>
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
			)}

			{/* Editing */}
			<section aria-labelledby="edit-heading" className="flex flex-col gap-6">
				<div>
					<h2 id="edit-heading" className="text-xl font-bold">{canEdit ? 'Edit the build' : 'The build'}</h2>
					<p className="text-sm text-ink-soft">{canEdit ? 'Every change recomputes the budget above. Nothing is stored until you save a revision; the draft stays in this browser.' : 'You can read this build; members and captains edit it.'}</p>
				</div>
				<EditGroup title="Cables" onAdd={canEdit ? () => add('cables', newCable) : undefined}>
					<PartTable caption="Cables" rows={draft.cables} columns={cableColumns(nodeOptions, units)} pathPrefix="cables" errors={errors} readOnly={!canEdit} onChange={(i, v) => update('cables', i, v)} onRemove={canEdit ? (i) => remove('cables', i) : undefined} rowFlag={(c) => (flagged.has(c.id) ? 'flag' : null)} />
				</EditGroup>
				<EditGroup title="Battery banks" onAdd={canEdit ? () => add('banks', newBank) : undefined}>
					<PartTable caption="Battery banks" rows={draft.banks} columns={bankColumns(nodeOptions)} pathPrefix="banks" errors={errors} readOnly={!canEdit} onChange={(i, v) => update('banks', i, v)} onRemove={canEdit ? (i) => remove('banks', i) : undefined} />
				</EditGroup>
				<EditGroup title="Alternators" onAdd={canEdit ? () => add('alternators', newAlternator) : undefined}>
					<PartTable caption="Alternators" rows={draft.alternators} columns={alternatorColumns(nodeOptions)} pathPrefix="alternators" errors={errors} readOnly={!canEdit} onChange={(i, v) => update('alternators', i, v)} onRemove={canEdit ? (i) => remove('alternators', i) : undefined} />
				</EditGroup>
				<EditGroup title="Amplifiers" onAdd={canEdit ? () => add('amplifiers', newAmplifier) : undefined}>
					<PartTable caption="Amplifiers" rows={draft.amplifiers} columns={amplifierColumns(nodeOptions)} pathPrefix="amplifiers" errors={errors} readOnly={!canEdit} onChange={(i, v) => update('amplifiers', i, v)} onRemove={canEdit ? (i) => remove('amplifiers', i) : undefined} />
				</EditGroup>
				<EditGroup title="Steady loads" onAdd={canEdit ? () => add('loads', newLoad) : undefined}>
					<PartTable caption="Steady loads" rows={draft.loads} columns={loadColumns(nodeOptions)} pathPrefix="loads" errors={errors} readOnly={!canEdit} onChange={(i, v) => update('loads', i, v)} onRemove={canEdit ? (i) => remove('loads', i) : undefined} />
				</EditGroup>
				<EditGroup title="Nodes" onAdd={canEdit ? () => add('nodes', newNode) : undefined}>
					<PartTable caption="Nodes" rows={draft.nodes} columns={nodeColumns()} pathPrefix="nodes" errors={errors} readOnly={!canEdit} onChange={(i, v) => update('nodes', i, v)} onRemove={canEdit ? (i) => remove('nodes', i) : undefined} />
				</EditGroup>
			</section>

			<section aria-labelledby="recent-heading">
				<h2 id="recent-heading" className="text-xl font-bold">Recent revisions</h2>
				{revisions.data.length === 0 ? (
					<p className="mt-2 text-sm text-ink-soft">No revision saved yet.</p>
				) : (
					<ol className="mt-2 divide-y divide-hairline rounded-md border border-hairline bg-card text-sm">
						{revisions.data.slice(0, 5).map((r) => (
							<li key={r.id} className="flex flex-wrap gap-3 px-4 py-2">
								<span className="num font-semibold">r{r.number}</span>
								<span className="flex-1">{r.message}</span>
								<span className="text-ink-soft">
									{r.authorName ?? 'someone'} · {formatDistanceToNow(new Date(r.createdAt), { addSuffix: true })}
								</span>
							</li>
						))}
					</ol>
				)}
				<a href={`/teams/${teamId}/vehicles/${vehicleId}/history`} className="mt-2 inline-block text-sm font-semibold text-copper underline">
					Full history with changes
				</a>
			</section>
			<p className="sr-only">{vehicleName}</p>
		</div>
	);
}

function Unit({ children }: { children: React.ReactNode }) {
	return <span className="text-xs font-light text-ink-soft">{children}</span>;
}

function ScenarioNumber({ label, unit, value, onChange, min, max, step }: { label: string; unit: string; value: number; onChange: (v: number) => void; min: number; max: number; step: number }) {
	const id = label.replace(/\W+/g, '-').toLowerCase();
	return (
		<div className="flex flex-col gap-1 text-sm">
			<label htmlFor={id} className="font-semibold">
				{label} <span className="font-normal text-ink-soft">({unit})</span>
			</label>
			<input id={id} type="number" className="num rounded-md border border-hairline px-2 py-1 text-right" value={Number(value.toFixed(3))} min={min} max={max} step={step} onChange={(e) => Number.isFinite(e.target.valueAsNumber) && e.target.valueAsNumber >= min && e.target.valueAsNumber <= max && onChange(e.target.valueAsNumber)} />
		</div>
	);
}

function Readouts({ report }: { report: Extract<ReturnType<typeof buildReport>, { ok: true }> }) {
	const minBurp = Math.min(...report.amplifiers.map((a) => a.burpTerminalV));
	const worstDb = Math.min(0, ...report.amplifiers.map((a) => a.burpOutputLossDb));
	const altShare = report.burp.alternators.reduce((s, a) => s + a.share, 0);
	const bankDraw = report.sustained.banks.reduce((s, b) => s + b.currentA, 0);
	const bus = Math.max(0, ...report.burp.banks.map((b) => b.terminalV), ...report.burp.alternators.filter((a) => a.mode !== 'off').map((a) => a.terminalV));
	const items = [
		{ label: 'System settles at, burp', value: report.burp.status === 'collapse' ? 'collapse' : fmt(bus), unit: report.burp.status === 'collapse' ? '' : 'V', tone: 'text-teal' },
		{ label: 'Lowest amplifier, burp', value: report.burp.status === 'collapse' ? 'collapse' : fmt(minBurp), unit: report.burp.status === 'collapse' ? '' : 'V', tone: report.burp.status === 'collapse' ? 'text-brick' : 'text-ink' },
		{ label: 'Worst output loss', value: fmt(worstDb), unit: 'dB', tone: worstDb < -1 ? 'text-amber' : 'text-ink' },
		{ label: 'Alternators carry', value: fmt(altShare * 100, 0), unit: '% of the burp', tone: 'text-teal' },
		{ label: 'Banks during music', value: bankDraw > 0.5 ? `▼ ${fmt(bankDraw, 0)}` : `▲ ${fmt(-bankDraw, 0)}`, unit: bankDraw > 0.5 ? 'A out' : 'A in', tone: bankDraw > 0.5 ? 'text-amber' : 'text-teal' },
		{ label: 'Cable loss, burp', value: fmt(report.burp.power.cableLossW, 0), unit: 'W', tone: 'text-copper' },
	];
	return (
		<section aria-label="Key figures" className="grid gap-3 sm:grid-cols-3 lg:grid-cols-6">
			{items.map((i) => (
				<div key={i.label} className="rounded-md border border-hairline bg-card p-3">
					<p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{i.label}</p>
					<p className={`num text-readout font-semibold ${i.tone}`}>
						{i.value} <span className="text-sm font-light text-ink-soft">{i.unit}</span>
					</p>
				</div>
			))}
		</section>
	);
}

function WarningList({ warnings }: { warnings: ReportWarning[] }) {
	return (
		<ul className="flex flex-col gap-1">
			{warnings.map((w, i) => (
				<li key={i} className={`text-xs ${w.severity === 'danger' ? 'text-brick' : 'text-ink'}`}>
					<span aria-hidden="true">{w.severity === 'danger' ? '⛔ ' : '⚠ '}</span>
					<span className="sr-only">{w.severity === 'danger' ? 'Safety finding: ' : 'Warning: '}</span>
					{w.message}
				</li>
			))}
			{warnings.some((w) => w.safety) && <li className="text-xs italic text-ink-soft">{SAFETY_LINE}</li>}
		</ul>
	);
}

function Findings({ warnings }: { warnings: ReportWarning[] }) {
	const build = warnings.filter((w) => w.element.kind !== 'cable');
	if (build.length === 0) return null;
	const safety = build.some((w) => w.safety);
	return (
		<section aria-labelledby="findings-heading" className={`rounded-md border p-4 ${safety ? 'border-brick/40 bg-brick-tint/40' : 'border-amber/40 bg-amber-tint/50'}`}>
			<h2 id="findings-heading" className="font-semibold">Findings</h2>
			<div className="mt-2">
				<WarningList warnings={build} />
			</div>
		</section>
	);
}

function EditGroup({ title, onAdd, children }: { title: string; onAdd?: () => void; children: React.ReactNode }) {
	return (
		<div>
			<div className="mb-2 flex items-center gap-3">
				<h3 className="font-semibold">{title}</h3>
				{onAdd && (
					<button type="button" onClick={onAdd} className="rounded-md border border-hairline bg-card px-2 py-0.5 text-sm hover:border-copper">
						+ Add
					</button>
				)}
			</div>
			{children}
		</div>
	);
}

function ConflictPanel({ theirs, mine, units, onKeepMine, onTakeTheirs }: { theirs: RevisionDto; mine: BuildDocument; units: UnitSystem; onKeepMine: () => void; onTakeTheirs: () => void }) {
	const diff = diffBuilds(theirs.document, mine);
	return (
		<div role="alert" className="rounded-md border border-amber/60 bg-amber-tint p-3 text-sm">
			<p className="font-semibold">
				Revision {theirs.number} (“{theirs.message}”, by {theirs.authorName ?? 'someone'}) was saved while you edited.
			</p>
			<p className="mt-1">Your draft differs from it in {diff.length} part{diff.length === 1 ? '' : 's'}:</p>
			<ul className="mt-1 list-disc pl-5">
				{diff.slice(0, 8).map((c) => (
					<li key={`${c.group}.${c.id}`}>
						{GROUP_NAMES[c.group]} {c.label}: {c.kind === 'changed' ? c.fields.map((f) => `${fieldName(f.field)} ${formatFieldValue(f.field, f.before, units)} → ${formatFieldValue(f.field, f.after, units)}`).join('; ') : c.kind === 'added' ? 'only in yours' : 'only in theirs'}
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
