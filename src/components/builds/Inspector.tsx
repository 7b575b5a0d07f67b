import { useEffect, useRef } from 'react';
import {
	PART_KINDS,
	partsOf,
	type BuildDocument,
	type BuildReport,
	type PartGroup,
	type ReportWarning,
} from '@/engine/browser';
import { fmt, GROUP_NAMES, lengthUnit, toLengthDisplay, type UnitSystem } from '@/lib/format';
import { Button } from '@/components/ui/Field';
import { UI_PART_KINDS } from './part-kinds';
import { WarningList } from './analysis/Findings';
import { type PartColumn, PartCell } from './PartTable';

type Ok = Extract<BuildReport, { ok: true }>;
export interface Selection {
	group: PartGroup;
	id: string;
}

type Rows = Array<[string, string]>;
type Figures = (id: string, report: Ok, doc: BuildDocument, units: UnitSystem) => Rows;

/** Each kind's own computed figures, in words and units (a node has none of its own). */
export const INSPECTOR_FIGURES: Record<PartGroup, Figures> = {
	nodes: () => [],
	loads: () => [],
	cables: (id, report, doc, units) => {
		const rows: Rows = [];
		const c = report.cables.find((x) => x.id === id);
		const cable = doc.cables.find((x) => x.id === id);
		if (!c || !cable) return rows;
		rows.push(
			['Current under burp', `${fmt(Math.abs(c.burp.currentA), 0)} A`],
			['Drop under burp', `${fmt(Math.abs(c.burp.dropV), 3)} V`],
			['Loss under burp', `${fmt(c.burp.lossW, 0)} W`],
			[
				'Circular mils per amp',
				`${Number.isFinite(c.cmilPerAmp) ? fmt(c.cmilPerAmp, 0) : '—'} (rule ${fmt(c.requiredCmilPerAmp, 0)})`,
			],
			['Carries (capacity)', c.ampacity ? `${fmt(c.ampacity.currentA, 0)} A` : 'unknown'],
			[
				'Heats to in the burp',
				`${c.burpHeating.finalC > 999 ? 'over 999' : fmt(c.burpHeating.finalC, 0)} °C (insulation ${fmt(c.burpHeating.limitC, 0)} °C)`,
			],
			[
				'Fuse advice',
				c.fuseAdvice === null
					? 'ground side: no fuse'
					: c.fuseAdvice.status === 'ok'
						? `${c.fuseAdvice.recommendedA} A (at most ${fmt(c.fuseAdvice.maxA, 0)} A)`
						: c.fuseAdvice.status === 'cable_too_small'
							? 'the cable is too small for its current'
							: 'capacity unknown',
			],
			[
				'Length',
				`${fmt(toLengthDisplay(cable.lengthM, units), units === 'imperial' ? 1 : 2)} ${lengthUnit(units)}`,
			],
		);
		return rows;
	},
	amplifiers: (id, report) => {
		const rows: Rows = [];
		const a = report.amplifiers.find((x) => x.id === id);
		if (!a) return rows;
		rows.push(
			['Terminal voltage, burp', `${fmt(a.burpTerminalV)} V`],
			['Terminal voltage, music', `${fmt(a.sustainedTerminalV)} V`],
			['Current, burp', `${fmt(a.burpCurrentA, 0)} A`],
			['Output, burp', `${fmt(a.burpOutputW, 0)} W (${fmt(a.burpOutputLossDb)} dB)`],
			['Lost in its feed and return, burp', `${fmt(a.burpDropV)} V`],
			[
				'Fed by',
				a.burpDropReference.kind === 'strongest'
					? 'no source current reaches it'
					: a.burpDropReference.sources
							.map((s) => `${s.label} ${Math.round(s.share * 100)} %`)
							.join(', '),
			],
			['Output model', a.outputModel === 'regulated' ? 'regulated' : 'unregulated, (V/V_rated)²'],
		);
		return rows;
	},
	banks: (id, report) => {
		const rows: Rows = [];
		const b = report.banks.find((x) => x.id === id);
		if (!b) return rows;
		rows.push(
			['Open-circuit voltage', `${fmt(b.ocvV)} V`],
			['Internal resistance', `${fmt(b.resistanceOhm * 1000, 2)} mΩ`],
			['Capacity', `${fmt(b.capacityAh, 0)} Ah`],
			['Current, burp', `${fmt(b.burpCurrentA, 0)} A out`],
			[
				'Current, music',
				b.sustainedCurrentA >= 0
					? `${fmt(b.sustainedCurrentA, 0)} A out`
					: `${fmt(-b.sustainedCurrentA, 0)} A in`,
			],
			['Charge acceptance', `${fmt(b.chargeAcceptanceA, 0)} A`],
		);
		return rows;
	},
	alternators: (id, report) => {
		const rows: Rows = [];
		const a = report.alternators.find((x) => x.id === id);
		if (!a) return rows;
		rows.push(
			['Output limit at this engine speed', `${fmt(a.limitA, 0)} A`],
			['Current, burp', `${fmt(a.burpCurrentA, 0)} A (${a.burpMode})`],
			['Current, music', `${fmt(a.sustainedCurrentA, 0)} A`],
		);
		return rows;
	},
	capacitors: (id, report) => {
		const c = report.capacitors.find((x) => x.id === id);
		if (!c) return [];
		return [
			['Capacitance', `${fmt(c.farads, c.farads < 10 ? 2 : 0)} F`],
			['Series resistance', `${fmt(c.esrOhm * 1000, 2)} mΩ`],
			['Rated voltage', `${fmt(c.ratedV, 1)} V`],
			['Highest voltage across it', `${fmt(c.highestV)} V`],
			['Largest current out', c.burpPeakA === null ? '—' : `${fmt(c.burpPeakA, 0)} A`],
			[
				'Share of the first 100 ms',
				c.shareFirst100ms === null ? '—' : `${fmt(c.shareFirst100ms * 100, 0)} %`,
			],
		];
	},
	chargers: (id, report) => {
		const c = report.chargers.find((x) => x.id === id);
		if (!c) return [];
		if (!c.running) return [['At this engine speed', 'not running']];
		return [
			['Output, music', `${fmt(c.outputA, 0)} A at ${fmt(c.outputV)} V`],
			['Input, music', `${fmt(c.inputA, 0)} A at ${fmt(c.inputV)} V`],
			['At its limit', c.atLimit ? `yes (${fmt(c.limitA, 0)} A)` : 'no'],
		];
	},
	isolators: (id, report, doc) => {
		const part = partsOf(doc, 'isolators').find((x) => x.id === id);
		const k = partsOf(doc, 'isolators').findIndex((x) => x.id === id);
		const burp = report.burp.isolators[k];
		const music = report.sustained.isolators[k];
		if (!part || !burp || !music) return [];
		const state = (r: typeof burp) =>
			!r.closed ? `open (holds ${fmt(Math.abs(r.dropV), 2)} V apart)` : `${fmt(r.currentA, 0)} A`;
		return [
			[
				'At this engine speed',
				burp.closed ? (part.kind === 'diode' ? 'free to conduct forward' : 'closed') : 'open',
			],
			['Current, burp', state(burp)],
			['Current, music', state(music)],
			['Drop, burp', burp.closed ? `${fmt(burp.dropV, 3)} V` : '—'],
			['Loss, burp', burp.closed ? `${fmt(burp.lossW, 0)} W` : '—'],
		];
	},
};

/**
 * One part, opened from the diagram or the part lists: its fields in words and units, its own
 * computed figures and its findings. A side panel on wide screens, a sheet from the bottom on
 * phones; Escape closes it and the focus goes back where it was.
 */
export function Inspector({
	selection,
	draft,
	report,
	errors,
	units,
	canEdit,
	onChange,
	onClose,
}: {
	selection: Selection;
	draft: BuildDocument;
	report: Ok | null;
	errors: Record<string, string>;
	units: UnitSystem;
	canEdit: boolean;
	onChange: (update: (d: BuildDocument) => BuildDocument) => void;
	onClose: () => void;
}) {
	const { group, id } = selection;
	const parts = partsOf(draft, group) as Array<{ id: string; label: string }>;
	const index = parts.findIndex((p) => p.id === id);
	const part = parts[index];
	const panel = useRef<HTMLElement>(null);
	useEffect(() => {
		const back = document.activeElement as HTMLElement | null;
		panel.current?.querySelector<HTMLElement>('input, select, button')?.focus();
		const onKey = (e: KeyboardEvent) => e.key === 'Escape' && onClose();
		window.addEventListener('keydown', onKey);
		return () => {
			window.removeEventListener('keydown', onKey);
			back?.focus?.();
		};
		// eslint-disable-next-line react-hooks/exhaustive-deps -- once per part opened
	}, [group, id]);
	if (!part) return null;
	const nodeOptions = draft.nodes.map((n) => ({ value: n.id, label: n.label || n.id }));
	const columns = UI_PART_KINDS[group].columns(nodeOptions, units) as unknown as PartColumn<{
		id: string;
		label: string;
	}>[];
	const kind = PART_KINDS[group].element;
	const findings: ReportWarning[] = report
		? report.warnings.filter((w) => w.element.kind === kind && w.element.id === id)
		: [];
	const figures = report ? INSPECTOR_FIGURES[group](id, report, draft, units) : [];
	return (
		<aside
			ref={panel}
			aria-label={`${GROUP_NAMES[group]} “${part.label || part.id}”`}
			className="fixed inset-x-0 bottom-0 z-40 max-h-[70vh] overflow-y-auto rounded-t-xl border-t-2 border-copper bg-card p-4 shadow-2xl lg:inset-x-auto lg:top-0 lg:right-0 lg:bottom-0 lg:max-h-none lg:w-96 lg:rounded-none lg:border-t-0 lg:border-l-2"
			data-inspector
		>
			<div className="flex items-start gap-2">
				<div className="min-w-0 flex-1">
					<p className="text-xs font-semibold tracking-wide text-copper-dark uppercase">
						{GROUP_NAMES[group]}
					</p>
					<h2 className="text-lg font-bold break-words">{part.label || part.id}</h2>
				</div>
				<Button type="button" variant="secondary" className="px-2 py-1 text-xs" onClick={onClose}>
					Close
				</Button>
			</div>
			{figures.length > 0 && (
				<dl className="mt-3 grid grid-cols-2 gap-x-3 gap-y-1 rounded-md bg-paper p-2 text-sm">
					{figures.map(([k, v]) => (
						<div key={k} className="min-w-0">
							<dt className="text-xs text-ink-soft">{k}</dt>
							<dd className="num font-semibold break-words">{v}</dd>
						</div>
					))}
				</dl>
			)}
			{findings.length > 0 && (
				<div className="mt-3">
					<h3 className="text-sm font-semibold">Findings</h3>
					<WarningList warnings={findings} />
				</div>
			)}
			<div className="mt-3 flex flex-col gap-2">
				{columns.map((col) => (
					<div key={col.id} className="grid grid-cols-[8rem_1fr] items-start gap-2 text-sm">
						<span className="pt-1 text-ink-soft">
							{col.header}
							{col.unit && ` (${col.unit})`}
						</span>
						<PartCell
							col={col}
							part={part}
							index={index}
							errors={errors}
							pathPrefix={group}
							readOnly={!canEdit}
							labelPrefix="Inspector · "
							onChange={(i, next) =>
								onChange((d) => ({
									...d,
									[group]: (partsOf(d, group) as unknown[]).map((x, j) => (j === i ? next : x)),
								}))
							}
						/>
					</div>
				))}
			</div>
		</aside>
	);
}
