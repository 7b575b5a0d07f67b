/// <reference lib="webworker" />
import { expose } from 'comlink';
// Relative on purpose: Vite bundles workers with their own resolver, which does not read the @/ alias.
import { type BuildDocument, runBurp, speedSweep, upgradeHints } from '../../engine';

/**
 * The editor's heavy engine work, off the page's main thread: the time-stepped burp (a thousand
 * solves) and the ranked single upgrades. Typing never waits for it.
 */
const api = {
	burp: (doc: BuildDocument, opts: Parameters<typeof runBurp>[1]) => runBurp(doc, opts),
	hints: (doc: BuildDocument, conditions: Parameters<typeof upgradeHints>[1]) =>
		upgradeHints(doc, conditions).slice(0, 5),
	sweep: (doc: BuildDocument, scenario: Parameters<typeof speedSweep>[1]) =>
		speedSweep(doc, scenario),
};

export type EngineWorkerApi = typeof api;

expose(api);
