import {
	headlineFigures as headline,
	addedFindings,
	type BuildReport,
	type HeadlineFigures,
	type ReportWarning,
} from '@/engine/browser';
import { fmt } from '@/lib/format';

type Ok = Extract<BuildReport, { ok: true }>;

interface Figure {
	key: string;
	label: string;
	/** The label on a phone, where a third of the width holds it. */
	short: string;
	unit: string;
	digits: number;
	/** Which way is better: up (more volts) or down (less loss). */
	better: 'up' | 'down';
	value: (h: HeadlineFigures) => number | null;
	show?: (x: number) => string;
	/** A word after the unit (which way the current goes). */
	word?: (x: number) => string;
}

const FIGURES: Figure[] = [
	{
		key: 'settle',
		label: 'Settles at, burp',
		short: 'Settles',
		unit: 'V',
		digits: 2,
		better: 'up',
		value: (h) => h.settleV,
	},
	{
		key: 'lowest',
		label: 'Lowest amplifier',
		short: 'Low amp',
		unit: 'V',
		digits: 2,
		better: 'up',
		value: (h) => h.lowestAmpV,
	},
	{
		key: 'loss',
		label: 'Worst output loss',
		short: 'Worst loss',
		unit: 'dB',
		digits: 2,
		better: 'up',
		value: (h) => h.worstLossDb,
	},
	{
		key: 'alt',
		label: 'Alternators carry',
		short: 'Alt. carry',
		unit: '%',
		digits: 0,
		better: 'up',
		value: (h) => h.alternatorShare * 100,
	},
	{
		key: 'bank',
		label: 'Banks at music level',
		short: 'Banks',
		unit: 'A',
		digits: 0,
		better: 'down',
		value: (h) => h.bankCurrentA,
		show: (x) => fmt(Math.abs(x), 0),
		word: (x) => (x > 0.5 ? 'out' : 'in'),
	},
	{
		key: 'cable',
		label: 'Cable loss, burp',
		short: 'Cable loss',
		unit: 'W',
		digits: 0,
		better: 'down',
		value: (h) => h.cableLossW,
	},
];

/**
 * The figures that matter, kept in view while editing anywhere on the page: each with its change
 * against the saved revision (before → after, better or worse in words and colour), and the
 * findings the change brought, next to the part that has them.
 */
export function SummaryStrip({
	report,
	baseline,
	stale,
	partLabel,
	extra,
	besideInspector = false,
	nav,
}: {
	report: Ok;
	/** The saved revision's report (null for a first revision or one that cannot be solved). */
	baseline: Ok | null;
	stale: boolean;
	/** A part's name for a finding's element, as the editor shows it. */
	partLabel: (w: ReportWarning) => string;
	/** Shown at the strip's end (the build page's way back to Save). */
	extra?: React.ReactNode;
	/** The inspector is open beside it (wide screens): the figures keep clear of its column. */
	besideInspector?: boolean;
	/** The page's in-page navigation, at hand wherever the member has scrolled to. */
	nav?: React.ReactNode;
}) {
	const now = headline(report);
	// Beside the inspector the strip has two thirds of a laptop's width: the phone's short labels.
	const short = besideInspector ? '' : 'sm:hidden';
	const long = besideInspector ? 'sr-only' : 'max-sm:sr-only';
	const before = baseline ? headline(baseline) : null;
	const added = baseline ? addedFindings(baseline.warnings, report.warnings) : [];
	const cleared = baseline ? addedFindings(report.warnings, baseline.warnings) : [];
	return (
		<section
			aria-label="Summary of the draft"
			className={`sticky top-0 z-30 -mx-gutter border-b border-hairline bg-paper/95 px-gutter py-2 backdrop-blur ${stale ? 'opacity-70' : ''} ${besideInspector ? 'lg:pr-[25rem]' : ''}`}
			data-summary
			// Changes with every recomputed figure: what the page bench waits for after a keystroke.
			data-figures={`${now.settleV}|${now.lowestAmpV}|${now.cableLossW}|${now.bankCurrentA}`}
		>
			<div className="grid grid-cols-4 gap-x-2 gap-y-1 sm:gap-x-3 lg:grid-cols-7">
				{FIGURES.map((f) => {
					const a = f.value(now);
					const b = before ? f.value(before) : null;
					return (
						<Cell
							short={short}
							long={long}
							compact={besideInspector}
							key={f.key}
							figure={f}
							after={now.collapse && f.unit === 'V' ? null : a}
							before={before && !(before.collapse && f.unit === 'V') ? b : null}
							collapse={now.collapse && f.unit === 'V'}
						/>
					);
				})}
				<div className="min-w-0" data-figure="findings">
					<p className="truncate text-[11px] font-semibold tracking-wide text-ink-soft uppercase">
						<span className={short} aria-hidden="true">
							Findings
						</span>
						<span className={long}>Findings</span>
					</p>
					<p className="num truncate text-sm font-semibold whitespace-nowrap">
						<span className={now.findings.danger ? 'text-brick' : ''}>
							{now.findings.danger} <span className={long}>danger</span>
						</span>{' '}
						·{' '}
						<span className={now.findings.warning ? 'text-amber-text' : ''}>
							{now.findings.warning} <span className={long}>warn</span>
						</span>
					</p>
					<p className="num h-4 text-[11px] leading-4 text-ink-soft">
						{before &&
						(before.findings.danger !== now.findings.danger ||
							before.findings.warning !== now.findings.warning)
							? `was ${before.findings.danger} · ${before.findings.warning}`
							: ''}
					</p>
				</div>
			</div>
			{extra}
			{/* One line, always there: what it says changes, its height never does, so nothing below moves. */}
			<p className="mt-1 h-4 truncate text-xs leading-4" aria-label="What the change did">
				{stale ? (
					<span className="font-semibold text-amber-text" role="status">
						Out of date: these are the last figures that could be computed.
					</span>
				) : added.length > 0 ? (
					<span className="text-brick" data-finding="new">
						<span aria-hidden="true">✕ </span>New on {partLabel(added[0]!)}: {added[0]!.message}
						{added.length > 1 && ` (and ${added.length - 1} more)`}
					</span>
				) : cleared.length > 0 ? (
					<span className="text-teal" data-finding="cleared">
						<span aria-hidden="true">✓ </span>Cleared on {partLabel(cleared[0]!)}:{' '}
						{cleared[0]!.message}
						{cleared.length > 1 && ` (and ${cleared.length - 1} more)`}
					</span>
				) : (
					<span className="text-ink-soft">
						{baseline ? 'Against the saved revision: no finding added or cleared.' : '\u00a0'}
					</span>
				)}
			</p>
			{nav}
		</section>
	);
}

function Cell({
	figure: f,
	after,
	before,
	collapse,
	short,
	long,
	compact,
}: {
	/** Beside the inspector: the narrow strip. */
	compact: boolean;
	/** Classes of the short (phone) label and of the full one. */
	short: string;
	long: string;
	figure: Figure;
	after: number | null;
	before: number | null;
	collapse: boolean;
}) {
	const show = (x: number) => (f.show ? f.show(x) : fmt(x, f.digits));
	const said = (x: number) => (f.word ? `${show(x)} ${f.word(x)}` : show(x));
	const changed =
		after !== null && before !== null && said(after) !== said(before) ? after - before : null;
	const better = changed !== null && (f.better === 'up' ? changed > 0 : changed < 0);
	return (
		<div className="min-w-0" data-figure={f.key}>
			<p className="truncate text-[11px] font-semibold tracking-wide text-ink-soft uppercase">
				<span className={short} aria-hidden="true">
					{f.short}
				</span>
				<span className={long}>{f.label}</span>
			</p>
			<p className="num text-sm font-semibold whitespace-nowrap">
				{collapse ? (
					<span className="text-brick">collapse</span>
				) : after === null ? (
					'—'
				) : (
					<>
						{show(after)} <span className="text-xs font-normal text-ink-soft">{f.unit}</span>
						{f.word && <span className="text-xs font-normal"> {f.word(after)}</span>}
					</>
				)}
			</p>
			{changed !== null && before !== null ? (
				<p
					className={`num h-4 text-[11px] leading-4 whitespace-nowrap ${better ? 'text-teal' : 'text-brick'}`}
					data-change={better ? 'better' : 'worse'}
				>
					{/* Beside the inspector, the value above is the after: only the before is said. */}
					{compact ? `was ${said(before)}` : `${said(before)} → ${said(after!)}`}{' '}
					<span className="sr-only">{better ? 'better' : 'worse'}</span>
					<span aria-hidden="true">{better ? '▲' : '▼'}</span>
				</p>
			) : (
				<p className="h-4" aria-hidden="true" />
			)}
		</div>
	);
}
