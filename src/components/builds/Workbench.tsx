import { useDeferredValue, useMemo, useState } from 'react';
import { buildReport, checkTopology, DEFAULT_SCENARIO, type ReportWarning, runBurp, upgradeHints } from '@/engine';
import type { BuildDocument, Scenario } from '@/engine';
import { buildDocumentSchema } from '@/lib/schemas/build-document';
import { fmt, lengthUnit, toLengthDisplay, type UnitSystem } from '@/lib/format';
import { FormMessage } from '@/components/ui/Field';
import { BudgetChart, BurpChart } from './Charts';
import { alternatorColumns, amplifierColumns, bankColumns, cableColumns, loadColumns, nodeColumns } from './editor-columns';
import { NetworkDiagram } from './NetworkDiagram';
import { newAlternator, newAmplifier, newBank, newCable, newLoad, newNode } from './new-parts';
import { PartTable } from './PartTable';

type Group = 'nodes' | 'cables' | 'banks' | 'alternators' | 'amplifiers' | 'loads';

/** Field errors of a draft by dotted path: the schema first, then the network's topology. */
export function validateDraft(doc: BuildDocument): Record<string, string> {
	const parsed = buildDocumentSchema.safeParse(doc);
	const errors: Record<string, string> = {};
	if (!parsed.success) {
		for (const i of parsed.error.issues) errors[i.path.map(String).join('.')] ??= i.message;
		return errors;
	}
	for (const i of checkTopology(parsed.data)) errors[i.path] ??= i.message;
	return errors;
}

export const SAFETY_LINE = 'These figures are estimates. Local codes, event rules and licensed practice govern high-current work.';

export interface WorkbenchProps {
	draft: BuildDocument;
	errors: Record<string, string>;
	units: UnitSystem;
	canEdit: boolean;
	onChange: (update: (d: BuildDocument) => BuildDocument) => void;
	/** What the editing section is called ("Edit the build", "Edit the plan"). */
	subject?: string;
}

/**
 * The shared build editor and its live analysis: conditions, key figures, findings, the network,
 * the budget, amplifiers, cables, the time-stepped burp, ranked upgrades and the part tables. Used
 * for revisions and for plans alike.
 */
export function Workbench({ draft, errors, units, canEdit, onChange, subject = 'build' }: WorkbenchProps) {
	const [scenario, setScenario] = useState<Scenario>(DEFAULT_SCENARIO);
	const valid = Object.keys(errors).length === 0;
	const report = useMemo(() => (valid ? buildReport(draft, scenario, { burpRun: false }) : null), [draft, scenario, valid]);
	const deferredDraft = useDeferredValue(draft);
	const burp = useMemo(() => {
		if (Object.keys(validateDraft(deferredDraft)).length) return null;
		return runBurp(deferredDraft, { engineRpm: scenario.engineRpm, demand: scenario.burpDemand, conductorTempC: scenario.conductorTempC, durationS: scenario.burpSeconds, stepS: scenario.burpStepS });
	}, [deferredDraft, scenario]);
	const hints = useMemo(() => {
		if (Object.keys(validateDraft(deferredDraft)).length) return null;
		return upgradeHints(deferredDraft, { engineRpm: scenario.engineRpm, demand: scenario.burpDemand, conductorTempC: scenario.conductorTempC }).slice(0, 5);
	}, [deferredDraft, scenario]);

	const ok = report && report.ok ? report : null;
	const warningsFor = (kind: string, id: string) => (ok ? ok.warnings.filter((w) => w.element.kind === kind && w.element.id === id) : []);
	const flagged = useMemo(() => new Set(ok ? ok.warnings.filter((w) => w.element.kind === 'cable' && w.severity !== 'info').map((w) => w.element.id) : []), [ok]);
	const nodeOptions = draft.nodes.map((n) => ({ value: n.id, label: n.label || n.id }));

	function update<G extends Group>(group: G, index: number, next: BuildDocument[G][number]) {
		onChange((d) => ({ ...d, [group]: d[group].map((x, i) => (i === index ? next : x)) }));
	}
	function add<G extends Group>(group: G, make: (d: BuildDocument) => BuildDocument[G][number]) {
		onChange((d) => ({ ...d, [group]: [...d[group], make(d)] }));
	}
	function remove(group: Group, index: number) {
		onChange((d) => ({ ...d, [group]: d[group].filter((_, i) => i !== index) }));
	}
	const set = <K extends keyof Scenario>(key: K, value: Scenario[K]) => setScenario((s) => ({ ...s, [key]: value }));
	const lu = lengthUnit(units);

	return (
		<>
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
										<td className={`px-3 py-1.5 text-right ${r.sustainedSurplusA < 0 ? 'text-amber-text' : 'text-teal'}`}>
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
										<td className={`px-3 py-1.5 text-right ${a.burpDropV > scenario.dropTargetV ? 'text-amber-text' : ''}`}>{a.burpDropV > scenario.dropTargetV ? '⚠ ' : ''}{fmt(a.burpDropV)} <Unit>V</Unit></td>
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
											<td className={`num px-3 py-1.5 text-right ${c.cmilPerAmp < c.requiredCmilPerAmp ? 'text-amber-text' : ''}`}>
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
					<h2 id="edit-heading" className="text-xl font-bold">{canEdit ? `Edit the ${subject}` : `The ${subject}`}</h2>
					<p className="text-sm text-ink-soft">{canEdit ? `Every change recomputes the budget above. Nothing is stored until you save; the draft stays in this browser.` : `You can read this ${subject}; members and captains edit it.`}</p>
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

		</>
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
		{ label: 'Worst output loss', value: fmt(worstDb), unit: 'dB', tone: worstDb < -1 ? 'text-amber-text' : 'text-ink' },
		{ label: 'Alternators carry', value: fmt(altShare * 100, 0), unit: '% of the burp', tone: 'text-teal' },
		{ label: 'Banks during music', value: bankDraw > 0.5 ? `▼ ${fmt(bankDraw, 0)}` : `▲ ${fmt(-bankDraw, 0)}`, unit: bankDraw > 0.5 ? 'A out' : 'A in', tone: bankDraw > 0.5 ? 'text-amber-text' : 'text-teal' },
		{ label: 'Cable loss, burp', value: fmt(report.burp.power.cableLossW, 0), unit: 'W', tone: 'text-copper-dark' },
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
					<span aria-hidden="true">{w.severity === 'danger' ? '✕ ' : '⚠ '}</span>
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

