/// <reference lib="webworker" />
import { expose } from 'comlink';
// Relative on purpose: Vite bundles workers with their own resolver, which does not read the @/ alias.
import {
	type BuildDocument,
	engineOffPlayTime,
	runBurp,
	runSession,
	speedSweep,
	upgradeHints,
} from '../../engine';
import { calibrateFromRun } from '../../engine/calibration';

/**
 * The editor's heavy engine work, off the page's main thread: the time-stepped burp (a thousand
 * solves), the ranked single upgrades, the speed sweep, the session of burps and the play time. Typing never waits for it.
 */
const api = {
	burp: (doc: BuildDocument, opts: Parameters<typeof runBurp>[1]) => runBurp(doc, opts),
	hints: (doc: BuildDocument, conditions: Parameters<typeof upgradeHints>[1]) =>
		upgradeHints(doc, conditions).slice(0, 5),
	sweep: (doc: BuildDocument, scenario: Parameters<typeof speedSweep>[1]) =>
		speedSweep(doc, scenario),
	session: (doc: BuildDocument, schedule: Parameters<typeof runSession>[1]) =>
		runSession(doc, schedule),
	playTime: (doc: BuildDocument, opts: Parameters<typeof engineOffPlayTime>[1]) =>
		engineOffPlayTime(doc, opts),
	calibrate: (
		doc: BuildDocument,
		samples: Parameters<typeof calibrateFromRun>[1],
		opts: Parameters<typeof calibrateFromRun>[2],
	) => calibrateFromRun(doc, samples, opts),
};

export type EngineWorkerApi = typeof api;

expose(api);
