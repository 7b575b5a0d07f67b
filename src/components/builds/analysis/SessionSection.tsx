import { useEffect, useMemo, useState } from 'react';
import {
	DEFAULT_SESSION,
	RECOVERY_TOLERANCE_V,
	type BuildDocument,
	type PlayTime,
	type Scenario,
	type SessionRun,
} from '@/engine/browser';
import { playTimeInWorker, sessionInWorker } from '@/lib/client/engine-worker';
import { fmt } from '@/lib/format';
import { SessionChart } from '../LazyCharts';
import { ScenarioNumber } from './ScenarioControls';
import { ScrollRegion } from '@/components/ui/ScrollRegion';

/** The schedule a member sets: how many burps, how long each, how long the rest between. */
const SCHEDULE_FIELDS = [
	{ key: 'burps', label: 'Burps', unit: 'count', min: 1, max: 30, step: 1 },
	{ key: 'burpS', label: 'Each burp', unit: 's', min: 1, max: 120, step: 1 },
	{ key: 'restS', label: 'Rest between', unit: 's', min: 0, max: 600, step: 5 },
] as const;

/** How long a schedule must sit still before the session runs again (ms). */
const SETTLE_MS = 200;

/** "1 h 12 min", "14 min", "40 s". */
export function formatDuration(seconds: number): string {
	if (seconds < 90) return `${Math.round(seconds)} s`;
	const minutes = Math.round(seconds / 60);
	if (minutes < 60) return `${minutes} min`;
	return `${Math.floor(minutes / 60)} h ${String(minutes % 60).padStart(2, '0')} min`;
}

/**
 * A whole session of burps through time (state of charge carried, the alternators recharging in
 * the rests) and how long the banks play music with the engine off: both run in the engine
 * worker once the draft and the schedule settle.
 */
export function SessionSection({
	draft,
	scenario,
	valid,
}: {
	draft: BuildDocument;
	scenario: Scenario;
	valid: boolean;
}) {
	const [schedule, setSchedule] = useState({
		burps: DEFAULT_SESSION.burps,
		burpS: scenario.burpSeconds,
		restS: DEFAULT_SESSION.restS,
	});
	const [result, setResult] = useState<{ run: SessionRun; play: PlayTime } | null>(null);
	const [stale, setStale] = useState(true);
	useEffect(() => {
		if (!valid) return;
		let current = true;
		setStale(true);
		const timer = setTimeout(() => {
			void Promise.all([
				sessionInWorker(draft, {
					...schedule,
					burpDemand: scenario.burpDemand,
					restDemand: 0,
					engineRpm: scenario.engineRpm,
					conductorTempC: scenario.conductorTempC,
				}),
				playTimeInWorker(draft, {
					demand: scenario.sustainedDemand,
					conductorTempC: scenario.conductorTempC,
					cutoffV: scenario.cutoffV,
				}),
			])
				.then(([run, play]) => {
					if (!current) return;
					setResult({ run, play });
					setStale(false);
				})
				.catch(() => current && setStale(true));
		}, SETTLE_MS);
		return () => {
			current = false;
			clearTimeout(timer);
		};
	}, [draft, scenario, valid, schedule]);
	const bankLabels = useMemo(
		() => Object.fromEntries(draft.banks.map((b) => [b.id, b.label || b.id])),
		[draft.banks],
	);
	const set = (key: keyof typeof schedule) => (v: number) =>
		setSchedule((s) => ({ ...s, [key]: v }));
	const run = result?.run;
	const hot = run?.cables
		.map((c) => ({ ...c, label: draft.cables.find((x) => x.id === c.id)?.label ?? c.id }))
		.filter((c) => c.finalC > c.limitC);
	return (
		<section aria-labelledby="session-heading">
			<h3 id="session-heading" className="text-lg font-bold">
				A session of burps
			</h3>
			<div className="mt-3 rounded-md border border-hairline bg-card p-3">
				<div className="grid gap-3 sm:grid-cols-3">
					{SCHEDULE_FIELDS.map((f) => (
						<ScenarioNumber
							key={f.key}
							label={f.label}
							unit={f.unit}
							value={schedule[f.key]}
							onChange={set(f.key)}
							min={f.min}
							max={f.max}
							step={f.step}
						/>
					))}
				</div>
				<p className="mt-2 text-xs text-ink-soft">
					At the conditions above: burp level during each burp, amplifiers idle in the rests, engine
					at {fmt(scenario.engineRpm, 0)} rpm throughout.
				</p>
				<div className={stale && result ? 'opacity-60' : undefined} aria-busy={stale}>
					{run && result ? (
						<>
							<div className="mt-3">
								<SessionChart run={run} bankLabels={bankLabels} />
							</div>
							<ScrollRegion label="Session, burp by burp" className="mt-3">
								<table className="num w-full text-sm">
									<caption className="sr-only">Each burp of the session</caption>
									<thead>
										<tr className="text-left">
											<th scope="col" className="py-1 pr-3">
												Burp
											</th>
											<th scope="col" className="py-1 pr-3">
												Lowest amplifier
											</th>
											{draft.banks.map((b) => (
												<th key={b.id} scope="col" className="py-1 pr-3">
													{b.label || b.id} after
												</th>
											))}
											<th scope="col" className="py-1 pr-3">
												Bus back within {fmt(RECOVERY_TOLERANCE_V, 2)} V
											</th>
										</tr>
									</thead>
									<tbody>
										{run.burps.map((b, i) => (
											<tr key={b.startS} className="border-t border-hairline">
												<th scope="row" className="py-1 pr-3 text-left font-normal">
													{i + 1} at {fmt(b.startS, 0)} s
												</th>
												<td className="py-1 pr-3">{fmt(b.lowestAmplifierV, 2)} V</td>
												{draft.banks.map((k) => (
													<td key={k.id} className="py-1 pr-3">
														{fmt((b.socAfter[k.id] ?? 0) * 100, 1)} %
													</td>
												))}
												<td className="py-1 pr-3">
													{b.recoveryS !== null
														? b.recoveryS === 0
															? 'at once'
															: `after ${formatDuration(b.recoveryS)}`
														: b.busAfterRestV !== null
															? `not before the next burp (${fmt(b.busAfterRestV, 2)} V against ${fmt(run.restingV, 2)} V)`
															: 'no rest'}
												</td>
											</tr>
										))}
									</tbody>
								</table>
							</ScrollRegion>
							<p className="mt-2 text-sm" data-session-summary>
								{run.collapsedAtS !== null ? (
									<span className="text-brick">
										✕ The voltage collapses {fmt(run.collapsedAtS, 1)} s into the session; the rest
										of it does not run.{' '}
									</span>
								) : null}
								{hot && hot.length > 0
									? `⚠ Over the whole session ${hot.map((c) => `“${c.label}” reaches ${fmt(Math.min(c.finalC, 999), 0)} °C past its ${fmt(c.limitC, 0)} °C insulation`).join('; ')} (adiabatic, no cooling in the rests: an upper bound).`
									: 'No cable passes its insulation rating over the whole session (adiabatic estimate, no cooling in the rests).'}
							</p>
							<p className="mt-2 text-sm" data-play-time>
								<strong>Engine off:</strong>{' '}
								{result.play.seconds === null
									? 'the banks carry the music level for more than 6 hours.'
									: result.play.endedBy === 'collapse'
										? `the voltage collapses after ${formatDuration(result.play.seconds)} at the music level.`
										: `the banks carry the music level (${fmt(scenario.sustainedDemand * 100, 1)} % of rated) for ${formatDuration(result.play.seconds)} until ${result.play.endedBy === 'empty' ? 'a bank is empty' : 'a bank reaches its cut-off voltage'}.`}{' '}
								<span className="text-ink-soft">
									Deep discharge shortens a bank’s life; follow the maker’s limits and the event’s
									rules on running with the engine off.
								</span>
							</p>
						</>
					) : (
						<p role="status" className="mt-3 h-[24rem] text-sm text-ink-soft">
							{valid ? 'Running the session…' : 'The session runs once the build is complete.'}
						</p>
					)}
				</div>
			</div>
		</section>
	);
}
