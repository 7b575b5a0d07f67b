import { type Remote, wrap } from 'comlink';
import { type BuildDocument, runBurp, speedSweep, upgradeHints } from '@/engine';
import type { EngineWorkerApi } from './engine.worker';

let remote: Remote<EngineWorkerApi> | null | undefined;

/**
 * The editor's engine worker, started on first use; where a browser (or a test) has no module
 * workers, the same functions run here instead, so the answer is the same either way.
 */
interface Engine {
	burp: (
		...a: Parameters<EngineWorkerApi['burp']>
	) => Promise<ReturnType<EngineWorkerApi['burp']>> | ReturnType<EngineWorkerApi['burp']>;
	hints: (
		...a: Parameters<EngineWorkerApi['hints']>
	) => Promise<ReturnType<EngineWorkerApi['hints']>> | ReturnType<EngineWorkerApi['hints']>;
	sweep: (
		...a: Parameters<EngineWorkerApi['sweep']>
	) => Promise<ReturnType<EngineWorkerApi['sweep']>> | ReturnType<EngineWorkerApi['sweep']>;
}

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
		}
	);
}

export const burpInWorker = (doc: BuildDocument, opts: Parameters<typeof runBurp>[1]) =>
	Promise.resolve(engine().burp(doc, opts));
export const hintsInWorker = (doc: BuildDocument, conditions: Parameters<typeof upgradeHints>[1]) =>
	Promise.resolve(engine().hints(doc, conditions));
export const sweepInWorker = (doc: BuildDocument, scenario: Parameters<typeof speedSweep>[1]) =>
	Promise.resolve(engine().sweep(doc, scenario));
