import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { Piscina } from 'piscina';
import { type EngineArgs, ENGINE_TASKS, type EngineTask } from './tasks';

/**
 * Engine work that misses the cache runs in a pool of worker threads, so one heavy request (a plan
 * comparison solves the network thousands of times) never stalls the others on the event loop.
 * `SAGWISE_ENGINE_THREADS` sets the pool's size (0: run inline); a pool that cannot start runs
 * the work inline and says so once.
 */
const WORKER = path.resolve(process.cwd(), 'src/lib/server/engine/worker.ts');

let pool: Piscina | null | undefined;

function enginePool(): Piscina | null {
	if (pool !== undefined) return pool;
	const threads = Number(
		process.env.SAGWISE_ENGINE_THREADS ?? Math.max(1, Math.min(4, availableParallelism() - 1)),
	);
	if (!(threads > 0) || !existsSync(WORKER)) return (pool = null);
	pool = new Piscina({
		filename: pathToFileURL(WORKER).href,
		// The worker is TypeScript, loaded the way the server itself is.
		execArgv: ['--import', 'tsx'],
		minThreads: 1,
		maxThreads: threads,
		idleTimeout: 60_000,
	});
	return pool;
}

export async function runEngine<T extends EngineTask>(
	task: T,
	args: EngineArgs<T>,
): Promise<string> {
	const p = enginePool();
	if (!p) return (ENGINE_TASKS[task] as (a: EngineArgs<T>) => string)(args);
	try {
		return (await p.run({ task, args })) as string;
	} catch (error) {
		// A worker that cannot load (no tsx here, a damaged install) must not take the route down.
		if (!(error instanceof Error) || !/Cannot find|ERR_|worker/i.test(error.message)) throw error;
		console.error('engine pool: running inline from now on:', error.message);
		pool = null;
		await p.destroy().catch(() => undefined);
		return (ENGINE_TASKS[task] as (a: EngineArgs<T>) => string)(args);
	}
}

/** Stops the pool's threads (the server's shutdown). */
export async function stopEnginePool(): Promise<void> {
	const p = pool;
	pool = undefined;
	await p?.destroy();
}
