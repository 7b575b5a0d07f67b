import {
	BarElement,
	CategoryScale,
	Chart as ChartJS,
	Legend,
	LinearScale,
	Tooltip,
} from 'chart.js';
import { useMemo } from 'react';
import { Bar } from 'react-chartjs-2';
import type { ComparisonColumn, ComparisonDto } from '@/lib/client/queries/plans';
import { fmt, formatMoney } from '@/lib/format';
import { CHART_COLOURS } from '@/components/builds/chart-data';
import { ScrollRegion } from '@/components/ui/ScrollRegion';
import { cell, FindingsCell, InstallButton, Row, signed, VoltageTrend } from './comparison-cells';

ChartJS.register(CategoryScale, LinearScale, BarElement, Tooltip, Legend);

interface Props {
	data: ComparisonDto;
	canInstall: boolean;
	/** The plan being installed right now. */
	installing: string | null;
	/** Plans already installed, with the revision they became. */
	installed: Map<string, number>;
	onInstall: (col: ComparisonColumn) => void;
}

const volts = (v: number | null) => (v === null ? 'collapse' : `${fmt(v)} V`);

/**
 * The current build and up to three plans in columns, one figure per row, with a bar chart of the
 * lowest amplifier voltage under burp and sustained music.
 */
export function ComparisonTable({ data, canInstall, installing, installed, onInstall }: Props) {
	const { columns, currency } = data;
	const ampIds = useMemo(() => {
		const seen = new Map<string, string>();
		for (const c of columns)
			for (const a of c.amplifiers) if (!seen.has(a.id)) seen.set(a.id, a.label);
		return [...seen];
	}, [columns]);
	const voltages = columns[0]?.budget.map((b) => b.voltageV) ?? [];
	// A plan that brings a danger finding is never the best value, however many dB it buys.
	const best = columns
		.slice(1)
		.reduce<ComparisonColumn | null>(
			(b, c) =>
				c.dbPerMoney !== null &&
				c.addedDangers.length === 0 &&
				(b === null || (b.dbPerMoney ?? 0) < c.dbPerMoney)
					? c
					: b,
			null,
		);

	const chart = useMemo(
		() => ({
			labels: columns.map((c) => c.name),
			datasets: [
				{
					label: 'Lowest amplifier, burp (V)',
					data: columns.map((c) => c.lowestAmplifierV.burp ?? 0),
					backgroundColor: CHART_COLOURS.copper,
				},
				{
					label: 'Lowest amplifier, music (V)',
					data: columns.map((c) => c.lowestAmplifierV.sustained ?? 0),
					backgroundColor: CHART_COLOURS.teal,
				},
			],
		}),
		[columns],
	);
	const lows = columns
		.flatMap((c) => [c.lowestAmplifierV.burp, c.lowestAmplifierV.sustained])
		.filter((v): v is number => v !== null);
	const chartOptions = useMemo(
		() => ({
			responsive: true,
			maintainAspectRatio: false,
			animation: false as const,
			scales: {
				y: {
					min: lows.length ? Math.floor(Math.min(...lows) - 0.5) : 0,
					title: { display: true, text: 'Voltage at the amplifier terminals (V)' },
				},
			},
			plugins: { legend: { position: 'bottom' as const } },
		}),
		[lows],
	);

	return (
		<div className="flex flex-col gap-4">
			<ScrollRegion
				label="Current build and plans side by side"
				className="rounded-md border border-hairline bg-card"
			>
				<table className="w-full text-sm" aria-label="Current build and plans side by side">
					<thead>
						<tr className="bg-slate-deep text-paper">
							<th className="px-3 py-2 text-left text-xs font-semibold uppercase tracking-wide">
								Figure
							</th>
							{columns.map((c, i) => (
								<th key={c.id} scope="col" className="px-3 py-2 text-right align-bottom">
									<span className="block text-xs font-normal uppercase tracking-wide text-paper/70">
										{i === 0 ? `revision ${data.head.number}` : `plan ${i}`}
									</span>
									<span className="font-semibold">{c.name}</span>
									{best?.id === c.id && (
										<span className="mt-1 block text-xs font-normal text-amber-tint">
											★ most dB for the money
										</span>
									)}
								</th>
							))}
						</tr>
					</thead>
					<tbody>
						<Row label="Parts cost">
							{columns.map((c, i) => cell(c.id, i === 0 ? '—' : formatMoney(c.cost, currency)))}
						</Row>
						<Row label="System settles at, burp" hint="strongest source's terminals">
							{columns.map((c) => cell(c.id, volts(c.busV.burp)))}
						</Row>
						<Row label="System settles at, music">
							{columns.map((c) => cell(c.id, volts(c.busV.sustained)))}
						</Row>
						<Row label="Lowest amplifier, burp">
							{columns.map((c) =>
								cell(
									c.id,
									volts(c.lowestAmplifierV.burp),
									c.lowestAmplifierV.burp === null ? 'text-brick' : '',
								),
							)}
						</Row>
						<Row label="Lowest amplifier, music">
							{columns.map((c) => cell(c.id, volts(c.lowestAmplifierV.sustained)))}
						</Row>
						<Row label="Hottest cable in the burp" hint="adiabatic estimate · insulation rating">
							{columns.map((c) =>
								cell(
									c.id,
									c.hottestCable
										? `${c.hottestCable.label}: ${c.hottestCable.finalC > 999 ? '> 999' : c.hottestCable.finalC.toFixed(0)} °C of ${c.hottestCable.limitC.toFixed(0)} °C`
										: '—',
									c.hottestCable && c.hottestCable.finalC > c.hottestCable.limitC
										? 'text-brick'
										: '',
								),
							)}
						</Row>
						<Row label="Alternators carry the music from" hint="engine speed, swept 600–4,000 rpm">
							{columns.map((c) =>
								cell(
									c.id,
									c.carriesMusicFromRpm === null
										? 'not up to 4,000 rpm'
										: `${c.carriesMusicFromRpm} rpm`,
								),
							)}
						</Row>
						{ampIds.map(([id, label]) => (
							<Row
								key={id}
								label={label}
								hint="terminals under burp · lowest during the time-stepped burp"
							>
								{columns.map((c) => {
									const a = c.amplifiers.find((x) => x.id === id);
									return cell(
										c.id,
										a ? (
											<>
												{fmt(a.burpV)} V{' '}
												<span className="text-ink-soft">
													· {a.burpRunMinV === null ? 'collapse' : `${fmt(a.burpRunMinV)} V`}
												</span>
											</>
										) : (
											'not fitted'
										),
										a ? '' : 'text-ink-soft',
									);
								})}
							</Row>
						))}
						<Row label="Output against the current build" hint="weakest amplifier, burp">
							{columns.map((c, i) =>
								cell(
									c.id,
									i === 0 ? '0.00 dB' : `${signed(c.deltaDb)} dB`,
									(c.deltaDb ?? 0) > 0.005
										? 'text-teal font-semibold'
										: (c.deltaDb ?? 0) < -0.005
											? 'text-brick'
											: '',
								),
							)}
						</Row>
						<Row label={`dB per 100 ${currency}`}>
							{columns.map((c, i) =>
								cell(c.id, i === 0 || c.dbPerMoney === null ? '—' : fmt(c.dbPerMoney * 100, 3)),
							)}
						</Row>
						<Row label="Banks carry the music deficit" hint="at the chosen engine speed">
							{columns.map((c) =>
								cell(
									c.id,
									c.carryHours === null
										? 'no deficit'
										: c.carryHours > 1
											? `${fmt(c.carryHours, 1)} h`
											: `${fmt(c.carryHours * 60, 0)} min`,
									c.carryHours === null ? 'text-teal' : '',
								),
							)}
						</Row>
						<Row
							label="Session of burps, lowest amplifier"
							hint="first burp · last burp, charge carried between"
						>
							{columns.map((c) =>
								cell(
									c.id,
									c.session === null
										? '—'
										: c.session.collapsedAtS !== null
											? `collapse at ${fmt(c.session.collapsedAtS, 0)} s`
											: `${volts(c.session.firstBurpV)} · ${volts(c.session.lastBurpV)}`,
									c.session?.collapsedAtS != null ? 'text-brick' : '',
								),
							)}
						</Row>
						<Row label="Charge left after the session" hint="all banks · lowest bank">
							{columns.map((c) =>
								cell(
									c.id,
									c.session === null
										? '—'
										: `${fmt(c.session.chargeLeftAh, 0)} Ah · ${fmt(c.session.lowestSocPct, 0)} %`,
								),
							)}
						</Row>
						<Row label="Music with the engine off" hint="until a bank reaches its cut-off">
							{columns.map((c) =>
								cell(
									c.id,
									c.engineOffPlayS === null
										? 'over 6 h'
										: c.engineOffPlayS >= 3600
											? `${fmt(c.engineOffPlayS / 3600, 1)} h`
											: `${fmt(c.engineOffPlayS / 60, 0)} min`,
								),
							)}
						</Row>
						{voltages.map((v, vi) => (
							<Row
								key={v}
								label={`Music surplus at ${fmt(v, 1)} V`}
								hint={vi === 0 ? 'alternators minus demand; − is drawn from the banks' : undefined}
							>
								{columns.map((c) => {
									const b = c.budget[vi];
									return cell(
										c.id,
										b ? `${signed(b.sustainedSurplusA, 0)} A` : '—',
										b && b.sustainedSurplusA < 0 ? 'text-amber-text' : 'text-teal',
									);
								})}
							</Row>
						))}
						<Row label="Cable warnings">
							{columns.map((c) => (
								<FindingsCell
									key={c.id}
									items={c.cableWarnings.map((w) => (
										<>{w}</>
									))}
								/>
							))}
						</Row>
						<Row
							label="Amplifier findings"
							hint="beside each: its own burp voltage against the current build"
						>
							{columns.map((c) => (
								<FindingsCell
									key={c.id}
									items={c.amplifierFindings.map((f) => (
										<>
											<VoltageTrend changeV={f.changeV} /> {f.message}
										</>
									))}
								/>
							))}
						</Row>
						<Row
							label="All findings"
							hint="danger · warnings, as the build page counts them; a danger a plan brings is named"
						>
							{columns.map((c) => (
								<td key={c.id} className="px-3 py-2 text-right align-top" data-findings={c.id}>
									<span className="num">
										<span className={c.findings.danger ? 'text-brick' : ''}>
											{c.findings.danger} danger
										</span>{' '}
										· {c.findings.warning} warning{c.findings.warning === 1 ? '' : 's'}
									</span>
									{c.addedDangers.length > 0 && (
										<ul className="mt-1 text-left text-xs text-brick" data-added-dangers>
											{c.addedDangers.map((d) => (
												<li key={d.key}>
													<span aria-hidden="true">✕ </span>
													<span className="sr-only">New safety finding: </span>
													{d.message}
												</li>
											))}
										</ul>
									)}
								</td>
							))}
						</Row>
						{canInstall && (
							<tr className="border-t border-hairline print:hidden">
								<th scope="row" className="bg-paper/60 px-3 py-2 text-left font-semibold">
									Install
								</th>
								{columns.map((c, i) => (
									<td key={c.id} className="px-3 py-2 text-right">
										{i === 0 ? null : installed.has(c.id) ? (
											<span className="text-xs font-semibold text-teal">
												✓ installed as r{installed.get(c.id)}
											</span>
										) : (
											<InstallButton
												name={c.name}
												dangers={c.addedDangers.map((d) => d.message)}
												busy={installing === c.id}
												disabled={installing !== null}
												onConfirm={() => onInstall(c)}
											/>
										)}
									</td>
								))}
							</tr>
						)}
					</tbody>
				</table>
			</ScrollRegion>
			<div className="rounded-md border border-hairline bg-card p-3">
				<div className="h-64">
					<Bar
						data={chart}
						options={chartOptions}
						role="img"
						aria-label="Lowest amplifier voltage for the current build and each plan"
					/>
				</div>
			</div>
			<p className="text-xs text-ink-soft">
				Output follows the square of the terminal voltage while an amplifier runs below its rated
				voltage (ΔL = 20·log₁₀ V/V₀). Costs are the plans' parts lists. These are estimates; local
				codes, event rules and licensed practice govern the installation.
			</p>
		</div>
	);
}
