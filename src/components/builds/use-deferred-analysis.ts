import { startTransition, useEffect, useState } from 'react';
import type { BurpRun, BuildDocument, Scenario, SpeedPoint, UpgradeHint } from '@/engine/browser';
import { burpInWorker, hintsInWorker, sweepInWorker } from '@/lib/client/engine-worker';

/** How long typing must pause before the heavy analysis starts again (ms). */
const SETTLE_MS = 150;

/**
 * The time-stepped burp and the ranked upgrades of a valid draft, computed in the engine worker
 * after typing pauses — never during the server render, never on the main thread. While a newer
 * draft is being computed the last answer stays, marked `stale`; an answer for an older draft
 * than the newest asked is dropped.
 */
export function useDeferredAnalysis(draft: BuildDocument, scenario: Scenario, valid: boolean) {
	const [state, setState] = useState<{
		burp: BurpRun | null;
		hints: UpgradeHint[] | null;
		sweep: { burp: SpeedPoint[]; sustained: SpeedPoint[] } | null;
		stale: boolean;
	}>({
		burp: null,
		hints: null,
		sweep: null,
		stale: true,
	});
	useEffect(() => {
		if (!valid) {
			setState((s) => (s.stale ? s : { ...s, stale: true }));
			return;
		}
		let current = true;
		setState((s) => (s.stale ? s : { ...s, stale: true }));
		const conditions = {
			engineRpm: scenario.engineRpm,
			demand: scenario.burpDemand,
			conductorTempC: scenario.conductorTempC,
		};
		const timer = setTimeout(() => {
			void Promise.all([
				burpInWorker(draft, {
					...conditions,
					durationS: scenario.burpSeconds,
					stepS: scenario.burpStepS,
				}),
				hintsInWorker(draft, conditions),
				sweepInWorker(draft, scenario),
			])
				// At transition priority: the burp chart and the hints render in slices, never blocking a key.
				.then(
					([burp, hints, sweep]) =>
						current && startTransition(() => setState({ burp, hints, sweep, stale: false })),
				)
				.catch(() => current && setState((s) => ({ ...s, stale: true })));
		}, SETTLE_MS);
		return () => {
			current = false;
			clearTimeout(timer);
		};
	}, [draft, scenario, valid]);
	return state;
}
