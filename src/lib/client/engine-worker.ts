import { type Remote, wrap } from 'comlink';
import type { BuildDocument } from '@/engine/browser';
import type { EngineWorkerApi } from './engine.worker';

let remote: Remote<EngineWorkerApi> | null | undefined;

type Maybe<F extends (...a: never[]) => unknown> = (
	...a: Parameters<F>
) => Promise<ReturnType<F>> | ReturnType<F>;
type Api = EngineWorkerApi;
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
			// Loaded only here, when there is no worker: the page itself never needs these modules.
			burp: async (doc, opts) => (await import('@/engine')).runBurp(doc, opts),
			hints: async (doc, c) => (await import('@/engine')).upgradeHints(doc, c).slice(0, 5),
			sweep: async (doc, s) => (await import('@/engine')).speedSweep(doc, s),
			session: async (doc, s) => (await import('@/engine')).runSession(doc, s),
			playTime: async (doc, o) => (await import('@/engine')).engineOffPlayTime(doc, o),
			calibrate: async (doc, s, o) =>
				(await import('@/engine/calibration')).calibrateFromRun(doc, s, o),
		}
	);
}

export const burpInWorker = (doc: BuildDocument, opts: Parameters<Api['burp']>[1]) =>
	Promise.resolve(engine().burp(doc, opts));
export const hintsInWorker = (doc: BuildDocument, conditions: Parameters<Api['hints']>[1]) =>
	Promise.resolve(engine().hints(doc, conditions));
export const sweepInWorker = (doc: BuildDocument, scenario: Parameters<Api['sweep']>[1]) =>
	Promise.resolve(engine().sweep(doc, scenario));
export const sessionInWorker = (doc: BuildDocument, schedule: Parameters<Api['session']>[1]) =>
	Promise.resolve(engine().session(doc, schedule));
export const playTimeInWorker = (doc: BuildDocument, opts: Parameters<Api['playTime']>[1]) =>
	Promise.resolve(engine().playTime(doc, opts));
/** Fits the model to a run's log off the page's main thread (a few hundred milliseconds). */
export const calibrateInWorker = (
	doc: BuildDocument,
	samples: Parameters<Api['calibrate']>[1],
	opts: Parameters<Api['calibrate']>[2],
) => Promise.resolve(engine().calibrate(doc, samples, opts));
