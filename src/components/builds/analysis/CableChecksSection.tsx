import {
	MATERIAL_PROPS,
	type BuildDocument,
	type Cable,
	type CableReport,
	type ReportWarning,
} from '@/engine/browser';
import { fmt, lengthUnit, toLengthDisplay, type UnitSystem } from '@/lib/format';
import { WarningList } from './Findings';
import { type ResultColumn, ResultTable, Unit } from './ResultTable';

function fuseAdvice(c: CableReport) {
	if (c.fuseAdvice === null) return <span className="text-ink-soft">ground side</span>;
	if (c.fuseAdvice.status === 'ok')
		return `${c.fuseAdvice.recommendedA} A (max ${fmt(c.fuseAdvice.maxA, 0)} A)`;
	if (c.fuseAdvice.status === 'cable_too_small')
		return <span className="text-brick">✕ cable too small</span>;
	return 'capacity unknown';
}

/** A cable's size, metal and length as a person reads them: "1/0 AWG, CCA (10 % Cu), 16.0 ft". */
function sizeText(c: Cable, units: UnitSystem): string {
	const size =
		c.size.kind === 'awg'
			? `${c.size.awg} AWG`
			: `${fmt(c.size.kind === 'mm2' ? c.size.mm2 : c.size.areaMm2, 1)} mm²`;
	const runs = c.parallelRuns > 1 ? ` × ${c.parallelRuns}` : '';
	const length = fmt(toLengthDisplay(c.lengthM, units), units === 'imperial' ? 1 : 2);
	return `${size}${runs}, ${MATERIAL_PROPS[c.material].label}, ${length} ${lengthUnit(units)}`;
}

/** Every cable under the burp: current, drop, loss, size against the rule, capacity, fuse advice, findings. */
export function CableChecksSection({
	cables,
	warnings,
	draft,
	units,
}: {
	cables: CableReport[];
	warnings: ReportWarning[];
	draft: BuildDocument;
	units: UnitSystem;
}) {
	const findingsOf = (id: string) =>
		warnings.filter((w) => w.element.kind === 'cable' && w.element.id === id);
	const lu = lengthUnit(units);
	const columns: ResultColumn<CableReport>[] = [
		{
			key: 'label',
			header: 'Cable',
			numeric: false,
			tone: () => 'font-semibold',
			cell: (c) => c.label,
		},
		{
			key: 'size',
			header: 'Size, metal, length',
			numeric: false,
			cell: (c) => {
				const cable = draft.cables.find((x) => x.id === c.id);
				return cable ? (
					<span className="whitespace-nowrap text-ink-soft">{sizeText(cable, units)}</span>
				) : (
					'—'
				);
			},
		},
		{
			key: 'current',
			header: 'Burp current',
			align: 'right',
			cell: (c) => (
				<>
					{fmt(Math.abs(c.burp.currentA), 0)} <Unit>A</Unit>
				</>
			),
		},
		{
			key: 'drop',
			header: 'Drop',
			align: 'right',
			cell: (c) => (
				<span data-testid={`drop-${c.id}`}>
					{fmt(Math.abs(c.burp.dropV), 3)} <Unit>V</Unit>
				</span>
			),
		},
		{
			key: 'loss',
			header: 'Loss',
			align: 'right',
			cell: (c) => (
				<>
					{fmt(c.burp.lossW, 0)} <Unit>W</Unit>
				</>
			),
		},
		{
			key: 'cmil',
			header: 'cmil/A (rule)',
			align: 'right',
			tone: (c) => (c.cmilPerAmp < c.requiredCmilPerAmp ? 'text-amber-text' : ''),
			cell: (c) => (
				<>
					{Number.isFinite(c.cmilPerAmp) ? fmt(c.cmilPerAmp, 0) : '—'}{' '}
					<Unit>({fmt(c.requiredCmilPerAmp, 0)})</Unit>
				</>
			),
		},
		{
			key: 'carries',
			header: 'Carries',
			align: 'right',
			cell: (c) => (
				<>
					{c.ampacity ? fmt(c.ampacity.currentA, 0) : '—'} <Unit>A</Unit>
				</>
			),
		},
		{
			key: 'heat',
			header: 'Heats to in the burp',
			align: 'right',
			tone: (c) => (c.burpHeating.finalC > c.burpHeating.limitC ? 'text-brick font-semibold' : ''),
			cell: (c) => (
				<>
					{c.burpHeating.finalC > 999 ? '> 999' : fmt(c.burpHeating.finalC, 0)} <Unit>°C</Unit>{' '}
					<Unit>(of {fmt(c.burpHeating.limitC, 0)})</Unit>
				</>
			),
		},
		{ key: 'fuse', header: 'Fuse advice', numeric: false, cell: fuseAdvice },
		{
			key: 'checks',
			header: 'Checks',
			numeric: false,
			cell: (c) => {
				const ws = findingsOf(c.id);
				return ws.length === 0 ? (
					<span className="text-teal">✓ ok</span>
				) : (
					<WarningList warnings={ws} />
				);
			},
		},
	];
	return (
		<section aria-labelledby="cables-heading">
			<h3 id="cables-heading" className="text-lg font-bold">
				Cables: current, drop and protection
			</h3>
			<ResultTable
				rows={cables}
				rowKey={(c) => c.id}
				columns={columns}
				label="Cable checks"
				rowProps={(c) => ({ 'data-cable-row': c.id })}
				className="mt-3"
			/>
			<p className="mt-1 text-xs text-ink-soft">
				Capacity from 33 CFR 183.425 Table 5 by insulation rating at 30 °C, no bundling derate; fuse
				up to 150 % of it (33 CFR 183.455). 300 cmil/A for copper is common practice, scaled for
				other metals. Burp heating: the adiabatic estimate of IEC 60949 (no heat let out, so an
				upper bound) over the burp's length from the cable temperature above, against the
				insulation's rating; CCA taken as aluminium. Lengths in {lu}: {cables.length}{' '}
				{cables.length === 1 ? 'cable' : 'cables'},{' '}
				{fmt(
					draft.cables.reduce((s, c) => s + toLengthDisplay(c.lengthM, units), 0),
					1,
				)}{' '}
				{lu} in all.
			</p>
		</section>
	);
}
