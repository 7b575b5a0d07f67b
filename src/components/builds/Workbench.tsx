import { memo, useCallback, useMemo, useRef, useState } from 'react';
import { useAfterPaint } from '@/lib/client/use-after-paint';
import {
	DEFAULT_SCENARIO,
	PART_GROUPS,
	PART_KINDS,
	partsOf,
	type BuildDocument,
	type PartGroup,
	type Scenario,
	type UpgradeHint,
} from '@/engine/browser';
// The engine's browser entry, unchecked: the draft is computed only once its field check passed
// (or, as first shown, the server checked it), and the scenario's inputs are bounded where typed.
// The checked index would bring the schema library with it to every page view.
import { GROUP_NAMES, partOfPath, type UnitSystem } from '@/lib/format';
import { FormMessage } from '@/components/ui/Field';
import { AmplifiersSection } from './analysis/AmplifiersSection';
import { BudgetSection } from './analysis/BudgetSection';
import { BurpSection } from './analysis/BurpSection';
import { CableChecksSection } from './analysis/CableChecksSection';
import { Findings } from './analysis/Findings';
import { SummaryStrip } from './analysis/SummaryStrip';
import { ScenarioControls } from './analysis/ScenarioControls';
import { SessionSection } from './analysis/SessionSection';
import { SpeedSweepSection } from './analysis/SpeedSweepSection';
import { UpgradeHintsSection } from './analysis/UpgradeHintsSection';
import { Inspector, type Selection } from './Inspector';
import { NetworkDiagram } from './NetworkDiagram';
import { reportOf } from './report-cache';
import { PartLists } from './PartLists';
import { PartEditor } from './PartEditor';
import { useDeferredAnalysis } from './use-deferred-analysis';
import { useHydrated } from '@/lib/client/use-hydrated';
import { PageSection, SectionNav, type SectionId, useOpenSections } from './PageSections';

/**
 * Parts past which the first render (the server's, and the browser's hydration of it) leaves the
 * diagram, the long tables and the part editor to the live page: laying out a thousand cables as
 * HTML on the server would hold every other request behind it.
 */
export const FIRST_RENDER_PARTS = 150;
/** Parts past which the network is listed rather than drawn. */
const DIAGRAM_PARTS = 150;
const partCount = (d: BuildDocument) =>
	PART_GROUPS.reduce((n, g) => (g === 'nodes' ? n : n + partsOf(d, g).length), 0);

export interface WorkbenchProps {
	draft: BuildDocument;
	errors: Record<string, string>;
	/** The draft's field check is still loading: the last computed figures stay meanwhile. */
	checking?: boolean;
	units: UnitSystem;
	canEdit: boolean;
	onChange: (update: (d: BuildDocument) => BuildDocument) => void;
	/** What the editing section is called ("Edit the build", "Edit the plan"). */
	subject?: string;
	/** The saved document the draft is compared with (before → after); none for a first revision. */
	baseline?: BuildDocument | null;
	/** The saved revision `baseline` is (its answers are shared across renders); none for a plan. */
	baselineRevisionId?: string | null;
	/** Shown in the sticky summary (the build page's unsaved-changes note and way to Save). */
	summaryExtra?: React.ReactNode;
	/** Right under the key figures (the build page's draft and save box). */
	afterSummary?: React.ReactNode;
	/**
	 * Whether the first render shows figures. The build page's server puts its saved head's report
	 * in place from the engine's pool first (and says so here); a plan page does not, so its
	 * figures are worked out in the browser once the island is live. The server's request thread
	 * never solves anything.
	 */
	computeOnServer?: boolean;
	/** Which page's open sections (and defaults) these are. */
	sections?: 'build' | 'plan';
	/** Makes a plan of a ranked upgrade and answers its address (members and captains). */
	onMakePlan?: (hint: UpgradeHint) => Promise<string>;
}

/** The part group a finding's or a hint's element names, from the engine's registry. */
const KIND_GROUP = Object.fromEntries(PART_GROUPS.map((g) => [PART_KINDS[g].element, g])) as Record<
	string,
	PartGroup | undefined
>;

/**
 * The shared build editor and its live analysis: conditions, key figures, findings, the network,
 * the budget, amplifiers, cables, the time-stepped burp, ranked upgrades and the part tables. Used
 * for revisions and for plans alike.
 */
export function Workbench({
	draft,
	errors,
	checking = false,
	units,
	canEdit,
	onChange,
	subject = 'build',
	baseline = null,
	baselineRevisionId = null,
	summaryExtra,
	afterSummary,
	computeOnServer = false,
	sections = 'plan',
	onMakePlan,
}: WorkbenchProps) {
	const hydrated = useHydrated();
	const canCompute = computeOnServer || hydrated;
	// A large build's diagram and tables wait for the live page (the summary and findings do not).
	const layOut = hydrated || partCount(draft) <= FIRST_RENDER_PARTS;
	const [scenario, setScenario] = useState<Scenario>(DEFAULT_SCENARIO);
	const [selection, setSelection] = useState<Selection | null>(null);
	const setSelectionFromDiagram = useMemo(
		() => (group: PartGroup, id: string) => setSelection({ group, id }),
		[],
	);
	const valid = !checking && Object.keys(errors).length === 0;
	const report = useMemo(
		() =>
			valid && canCompute
				? reportOf(draft, scenario, units, draft === baseline ? baselineRevisionId : null)
				: null,
		[draft, scenario, valid, canCompute, units, baseline, baselineRevisionId],
	);
	const baseReport = useMemo(() => {
		if (!baseline || !canCompute) return null;
		const r = reportOf(baseline, scenario, units, baselineRevisionId);
		return r?.ok ? r : null;
	}, [baseline, scenario, units, baselineRevisionId, canCompute]);
	// The heavy part (burp, upgrades) runs in the engine worker once typing pauses.
	const { burp, hints, sweep, stale: hintsStale } = useDeferredAnalysis(draft, scenario, valid);
	// The build the ranking was made from, to price its changes from the shelf: taken when the
	// ranking arrives, so typing does not render the ranking again.
	// eslint-disable-next-line react-hooks/exhaustive-deps -- follows the ranking, not each keystroke
	const hintsBase = useMemo(() => draft, [hints]);
	const { open, set: setOpenSection } = useOpenSections(sections);
	const openFromNav = useCallback(
		(id: SectionId) => {
			if (id !== 'findings' && id !== 'upgrades') setOpenSection(id, true);
		},
		[setOpenSection],
	);

	const fresh = report && report.ok ? report : null;
	// While a field is cleared or mistyped the last figures that could be computed stay on screen,
	// marked as out of date, so the page neither blanks nor jumps under the member's cursor.
	const lastGood = useRef<typeof fresh>(null);
	// The draft those figures came from: the tables beside them describe it, not a half-typed one.
	const lastGoodDraft = useRef<BuildDocument>(draft);
	if (fresh) {
		lastGood.current = fresh;
		lastGoodDraft.current = draft;
	}
	const ok = fresh ?? lastGood.current;
	const stale = !fresh && ok !== null;
	// The summary and the field being typed in follow every keystroke; the long tables, charts and
	// the diagram follow at a lower priority, in slices React can interrupt, so typing never waits.
	const later = useAfterPaint(ok);
	const laterDraft = useAfterPaint(fresh ? draft : lastGoodDraft.current);
	const flagged = useMemo(
		() =>
			new Set(
				later
					? later.warnings
							.filter((w) => w.element.kind === 'cable' && w.severity !== 'info')
							.map((w) => w.element.id)
					: [],
			),
		[later],
	);

	return (
		<>
			{ok && (
				<SummaryStrip
					report={ok}
					baseline={baseReport}
					stale={stale}
					extra={summaryExtra}
					nav={<SectionNav onOpen={openFromNav} />}
					besideInspector={selection !== null}
					partLabel={(w) => {
						const group = KIND_GROUP[w.element.kind];
						const part = group
							? (draft[group] as Array<{ id: string; label?: string }>).find(
									(p) => p.id === w.element.id,
								)
							: undefined;
						return part && group ? `${GROUP_NAMES[group]} “${part.label || part.id}”` : 'the build';
					}}
				/>
			)}
			{/* Always one line tall, error or not: a message appearing here must not push the part being edited down the page. */}
			<div className="h-16 overflow-hidden sm:h-11 [&_p>span:last-child]:line-clamp-2">
				{!canCompute ? (
					<FormMessage tone="info">Working out the figures…</FormMessage>
				) : valid ? (
					<FormMessage tone="info">Every field reads: the figures below are current.</FormMessage>
				) : checking ? (
					<FormMessage tone="info">Checking your change…</FormMessage>
				) : (
					<FormMessage tone="error">
						{stale
							? 'These figures are from before your last change, which cannot be computed yet: '
							: 'The build cannot be computed until the marked fields are fixed: '}
						{Object.entries(errors)
							.slice(0, 3)
							.map(([p, m]) => `${partOfPath(draft, p)}: ${m}`)
							.join(' · ')}
					</FormMessage>
				)}
			</div>

			{afterSummary}

			<ScenarioControls scenario={scenario} onChange={setScenario} />

			<FindingsMemo warnings={later?.warnings ?? null} />

			{layOut && (
				<UpgradeHintsSectionMemo
					hints={hints}
					stale={stale || hintsStale}
					fromDraft={baseline !== null && draft !== baseline}
					onMakePlan={canEdit ? onMakePlan : undefined}
					before={hintsBase}
				/>
			)}

			<PageSection
				id="network"
				title="Network"
				note={`${draft.nodes.length} nodes · ${draft.cables.length} cables · ${partCount(draft) - draft.cables.length} parts`}
				open={open.network}
				onToggle={(v) => setOpenSection('network', v)}
			>
				{layOut ? (
					<div>
						{partCount(laterDraft) <= DIAGRAM_PARTS ? (
							<NetworkDiagramMemo
								doc={laterDraft}
								flagged={flagged}
								onSelect={setSelectionFromDiagram}
							/>
						) : (
							<p className="rounded-md border border-dashed border-hairline bg-card p-4 text-sm text-ink-soft">
								A build of {partCount(laterDraft)} parts is past what a diagram can show legibly (
								{DIAGRAM_PARTS}); the lists below open every part, and the tables list every
								connection.
							</p>
						)}
						<PartLists
							draft={laterDraft}
							flagged={flagged}
							warned={later?.warnings ?? []}
							selected={selection}
							onSelect={setSelection}
						/>
					</div>
				) : (
					<p className="rounded-md border border-dashed border-hairline bg-card p-4 text-sm text-ink-soft">
						A build of {partCount(draft)} parts: its diagram and tables are laid out once the page
						is live…
					</p>
				)}
			</PageSection>

			<PageSection
				id="supply"
				title="Demand and supply"
				note="the budget at fixed voltages and each amplifier under the burp"
				open={open.supply}
				onToggle={(v) => setOpenSection('supply', v)}
			>
				{later && layOut ? (
					<>
						<BudgetSectionMemo rows={later.budget} />
						<AmplifiersSectionMemo
							amplifiers={later.amplifiers}
							dropTargetV={scenario.dropTargetV}
							burpSeconds={scenario.burpSeconds}
							burp={burp}
						/>
					</>
				) : (
					<Waiting />
				)}
			</PageSection>

			<PageSection
				id="session"
				title="Session"
				note={`a ${scenario.burpSeconds} s burp step by step, and burp after burp`}
				open={open.session}
				onToggle={(v) => setOpenSection('session', v)}
			>
				{later && layOut ? (
					<>
						<BurpSectionMemo
							burp={burp}
							burpSeconds={scenario.burpSeconds}
							draft={laterDraft}
							ruleV={
								later.amplifiers.length
									? Math.max(...later.banks.map((b) => b.ocvV), 0) - scenario.dropTargetV
									: null
							}
						/>
						<SessionSectionMemo draft={laterDraft} scenario={scenario} valid={valid} />
					</>
				) : (
					<Waiting />
				)}
			</PageSection>

			<PageSection
				id="speed"
				title="Speed"
				note="from idle to high engine speed"
				open={open.speed}
				onToggle={(v) => setOpenSection('speed', v)}
			>
				{later && layOut ? <SpeedSweepSectionMemo sweep={sweep} /> : <Waiting />}
			</PageSection>

			<PageSection
				id="heating"
				title="Heating"
				note="each cable's current, drop, temperature and protection"
				open={open.heating}
				onToggle={(v) => setOpenSection('heating', v)}
			>
				{later && layOut ? (
					<CableChecksSectionMemo
						cables={later.cables}
						warnings={later.warnings}
						draft={laterDraft}
						units={units}
					/>
				) : (
					<Waiting />
				)}
			</PageSection>

			<PageSection
				id="parts"
				title="Parts"
				note={canEdit ? `every part's fields: edit the ${subject} here` : `every part's fields`}
				open={open.parts}
				onToggle={(v) => setOpenSection('parts', v)}
			>
				{layOut ? (
					<PartEditor
						draft={draft}
						errors={errors}
						units={units}
						canEdit={canEdit}
						onChange={onChange}
						subject={subject}
						flagged={flagged}
					/>
				) : (
					<Waiting />
				)}
			</PageSection>

			{selection && (
				<Inspector
					selection={selection}
					draft={draft}
					report={ok}
					errors={errors}
					units={units}
					canEdit={canEdit}
					onChange={onChange}
					onClose={() => setSelection(null)}
				/>
			)}
		</>
	);
}

// Each analysis section renders again only when its own figures change.
const FindingsMemo = memo(Findings);
const NetworkDiagramMemo = memo(NetworkDiagram);
const BudgetSectionMemo = memo(BudgetSection);
const AmplifiersSectionMemo = memo(AmplifiersSection);
const CableChecksSectionMemo = memo(CableChecksSection);
const BurpSectionMemo = memo(BurpSection);
const UpgradeHintsSectionMemo = memo(UpgradeHintsSection);
const SpeedSweepSectionMemo = memo(SpeedSweepSection);
const SessionSectionMemo = memo(SessionSection);

/** A section opened before its figures are in. */
function Waiting() {
	return (
		<p role="status" className="text-sm text-ink-soft">
			Working out the figures…
		</p>
	);
}
