import type { AmplifierReport, BurpRun } from '@/engine/browser';
import { fmt } from '@/lib/format';
import { type ResultColumn, ResultTable, Unit } from './ResultTable';

/** Each amplifier under the burp: its terminal voltage, what the wiring takes, its output against the rating. */
export function AmplifiersSection({
	amplifiers,
	dropTargetV,
	burpSeconds,
	burp,
}: {
	amplifiers: AmplifierReport[];
	dropTargetV: number;
	burpSeconds: number;
	burp: BurpRun | null;
}) {
	const columns: ResultColumn<AmplifierReport>[] = [
		{
			key: 'label',
			header: 'Amplifier',
			numeric: false,
			tone: () => 'font-semibold',
			cell: (a) => a.label,
		},
		{
			key: 'music',
			header: 'Terminals, music',
			align: 'right',
			cell: (a) => (
				<>
					{fmt(a.sustainedTerminalV)} <Unit>V</Unit>
				</>
			),
		},
		{
			key: 'burp',
			header: 'Terminals, burp',
			align: 'right',
			cell: (a) => (
				<>
					{fmt(a.burpTerminalV)} <Unit>V</Unit>
				</>
			),
		},
		{
			key: 'drop',
			header: 'Lost to wiring',
			align: 'right',
			tone: (a) => (a.burpDropV > dropTargetV ? 'text-amber-text' : ''),
			cell: (a) => (
				<>
					{a.burpDropV > dropTargetV ? '⚠ ' : ''}
					{fmt(a.burpDropV)} <Unit>V</Unit>
				</>
			),
		},
		{
			key: 'current',
			header: 'Current',
			align: 'right',
			cell: (a) => (
				<>
					{fmt(a.burpCurrentA, 0)} <Unit>A</Unit>
				</>
			),
		},
		{
			key: 'output',
			header: 'Output',
			align: 'right',
			cell: (a) => (
				<>
					{fmt(a.burpOutputW, 0)} <Unit>W</Unit>
				</>
			),
		},
		{
			key: 'loss',
			header: 'vs rating',
			align: 'right',
			cell: (a) => (
				<>
					{fmt(a.burpOutputLossDb)} <Unit>dB</Unit>
				</>
			),
		},
		{
			key: 'lowest',
			header: `Lowest in a ${burpSeconds} s burp`,
			align: 'right',
			cell: (a) => (
				<>
					{burp ? fmt(burp.amplifierMinV[a.id]) : '…'} <Unit>V</Unit>
				</>
			),
		},
	];
	return (
		<section aria-labelledby="amps-heading">
			<h3 id="amps-heading" className="text-lg font-bold">
				Amplifiers under the burp
			</h3>
			<ResultTable rows={amplifiers} rowKey={(a) => a.id} columns={columns} className="mt-3" />
		</section>
	);
}
