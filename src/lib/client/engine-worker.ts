import { type Remote, wrap } from 'comlink';
import {
	type BuildDocument,
	calibrateFromRun,
	engineOffPlayTime,
	runBurp,
	runSession,
	speedSweep,
	upgradeHints,
} from '@/engine';
import type { EngineWorkerApi } from './engine.worker';

let remote: Remote<EngineWorkerApi> | null | undefined;

type Maybe<F extends (...a: never[]) => unknown> = (
	...a: Parameters<F>
) => Promise<ReturnType<F>> | ReturnType<F>;
type Engine = { [K in keyof EngineWorkerApi]: Maybe<EngineWorkerApi[K]> };

/**
 * The editor's engine worker, started on first use; where a browser (or a test) has no module
 * workers, the same functions run here instead, so the answer is the same either way.
 */
function engine(): Engine {
	if (remote === undefined) {
		try {
			remote =
				typeof Worker === 'undefined'
					? null
					: wrap<EngineWorkerApi>(
							new Worker(new URL('./engine.worker.ts', import.meta.url), { type: 'module' }),
						);
		} catch {
			remote = null;
		}
	}
	return (
		remote ?? {
			burp: (doc: BuildDocument, opts: Parameters<typeof runBurp>[1]) => runBurp(doc, opts),
			hints: (doc: BuildDocument, c: Parameters<typeof upgradeHints>[1]) =>
				upgradeHints(doc, c).slice(0, 5),
			sweep: (doc: BuildDocument, s: Parameters<typeof speedSweep>[1]) => speedSweep(doc, s),
			session: (doc: BuildDocument, s: Parameters<typeof runSession>[1]) => runSession(doc, s),
			playTime: (doc: BuildDocument, o: Parameters<typeof engineOffPlayTime>[1]) =>
				engineOffPlayTime(doc, o),
			calibrate: (
				doc: BuildDocument,
				s: Parameters<typeof calibrateFromRun>[1],
				o: Parameters<typeof calibrateFromRun>[2],
			) => calibrateFromRun(doc, s, o),
		}
	);
}

export const burpInWorker = (doc: BuildDocument, opts: Parameters<typeof runBurp>[1]) =>
	Promise.resolve(engine().burp(doc, opts));
export const hintsInWorker = (doc: BuildDocument, conditions: Parameters<typeof upgradeHints>[1]) =>
	Promise.resolve(engine().hints(doc, conditions));
export const sweepInWorker = (doc: BuildDocument, scenario: Parameters<typeof speedSweep>[1]) =>
	Promise.resolve(engine().sweep(doc, scenario));
export const sessionInWorker = (doc: BuildDocument, schedule: Parameters<typeof runSession>[1]) =>
	Promise.resolve(engine().session(doc, schedule));
export const playTimeInWorker = (
	doc: BuildDocument,
	opts: Parameters<typeof engineOffPlayTime>[1],
) => Promise.resolve(engine().playTime(doc, opts));
/** Fits the model to a run's log off the page's main thread (a few hundred milliseconds). */
export const calibrateInWorker = (
	doc: BuildDocument,
	samples: Parameters<typeof calibrateFromRun>[1],
	opts: Parameters<typeof calibrateFromRun>[2],
) => Promise.resolve(engine().calibrate(doc, samples, opts));
