import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { Piscina } from 'piscina';
import { errorField, log } from '@/lib/server/log';
import {
	engineCancelled,
	engineQueueDepth,
	engineRefused,
	engineRun,
	engineRunning,
	engineWait,
} from '@/lib/server/metrics';
import { type EngineArgs, type EngineResult, ENGINE_TASKS, type EngineTask } from './tasks';

/**
 * The one door to the engine for the server: every computation a page or an API asks for runs in
 * a pool of worker threads, never on the request thread, so one heavy request cannot stall the
 * others. In front of the pool sits a queue that is
 *
 * - **bounded**: past `SAGWISE_ENGINE_QUEUE` waiting computations in all, or a team's share of them,
 *   a request is refused with {@link EngineBusy} (answered 503 with Retry-After);
 * - **fair**: each team has its own line, and a free thread takes the next computation from the
 *   next team in turn, so one team's heavy requests cannot starve another's;
 * - **cancellable**: a computation whose caller's signal aborts (the client went away) leaves the
 *   line, or, when already running, is stopped.
 *
 * `SAGWISE_ENGINE_THREADS` sets the pool's size (0: run inline, for tools); a pool that cannot
 * start runs the work inline and says so once.
 */
const WORKER = path.resolve(process.cwd(), 'src/lib/server/engine/worker.ts');

const THREADS = Number(
	process.env.SAGWISE_ENGINE_THREADS ?? Math.max(1, Math.min(4, availableParallelism() - 1)),
);
/** Computations that may wait in all, and per team. */
const MAX_QUEUE = Math.max(1, Number(process.env.SAGWISE_ENGINE_QUEUE ?? 64));
const MAX_TEAM_QUEUE = Math.max(
	1,
	Number(process.env.SAGWISE_ENGINE_TEAM_QUEUE ?? Math.ceil(MAX_QUEUE / 4)),
);

let pool: Piscina | null | undefined;

function enginePool(): Piscina | null {
	if (pool !== undefined) return pool;
	if (!(THREADS > 0) || !existsSync(WORKER)) return (pool = null);
	pool = new Piscina({
		filename: pathToFileURL(WORKER).href,
		// The worker is TypeScript, loaded the way the server itself is.
		execArgv: ['--import', 'tsx'],
		minThreads: 1,
		maxThreads: THREADS,
		idleTimeout: 60_000,
	});
	return pool;
}

/** The engine's line is full: try again after `retryAfterS` seconds. */
export class EngineBusy extends Error {
	constructor(readonly retryAfterS: number) {
		super('The engine is busy with other requests');
		this.name = 'EngineBusy';
	}
}

/** Who asks and until when: the team whose line the work joins, and the caller's signal. */
export interface EngineCall {
	/** The team the work is for (its line); work of no team shares one line. */
	team?: string;
	/** Aborts when the caller no longer wants the answer (the client disconnected). */
	signal?: AbortSignal;
}

interface Job {
	task: EngineTask;
	args: unknown;
	team: string;
	signal?: AbortSignal;
	queuedAt: number;
	resolve: (value: unknown) => void;
	reject: (error: unknown) => void;
	onAbort?: () => void;
}

/** Lines by team, in turn order (a team served moves to the back). */
const lines = new Map<string, Job[]>();
let waiting = 0;
let running = 0;
/** Mean seconds a computation runs, smoothed, for the Retry-After estimate. */
let meanRunS = 0.2;

const abortError = () => new DOMException('The caller went away', 'AbortError');

function refuse(reason: 'queue_full' | 'team_share'): Promise<never> {
	engineRefused.inc({ reason });
	const slots = Math.max(1, THREADS);
	const retryAfterS = Math.min(
		60,
		Math.max(1, Math.ceil(((waiting + running) * meanRunS) / slots)),
	);
	return Promise.reject(new EngineBusy(retryAfterS));
}

function pump(): void {
	const slots = Math.max(1, THREADS);
	while (running < slots && waiting > 0) {
		const [team, line] = lines.entries().next().value as [string, Job[]];
		const job = line.shift()!;
		lines.delete(team);
		if (line.length > 0) lines.set(team, line);
		waiting--;
		engineQueueDepth.set(waiting);
		if (job.onAbort) job.signal?.removeEventListener('abort', job.onAbort);
		start(job);
	}
}

function start(job: Job): void {
	running++;
	engineRunning.set(running);
	const began = performance.now();
	engineWait.observe({ task: job.task }, (began - job.queuedAt) / 1000);
	const finish = (outcome: 'ok' | 'error' | 'cancelled') => {
		const s = (performance.now() - began) / 1000;
		engineRun.observe({ task: job.task, outcome }, s);
		if (outcome === 'ok') meanRunS = meanRunS * 0.8 + s * 0.2;
		running--;
		engineRunning.set(running);
		pump();
	};
	execute(job.task, job.args, job.signal).then(
		(value) => {
			finish('ok');
			job.resolve(value);
		},
		(error: unknown) => {
			const cancelled = job.signal?.aborted ?? false;
			if (cancelled) engineCancelled.inc();
			finish(cancelled ? 'cancelled' : 'error');
			job.reject(cancelled ? abortError() : error);
		},
	);
}

const inline = (task: EngineTask, args: unknown) =>
	(ENGINE_TASKS[task] as (a: unknown) => unknown)(args);

async function execute(task: EngineTask, args: unknown, signal?: AbortSignal): Promise<unknown> {
	const p = enginePool();
	if (!p) {
		// Inline (no pool): still after the current turn of the event loop, so a queued request is served in order.
		await new Promise((r) => setImmediate(r));
		if (signal?.aborted) throw abortError();
		return inline(task, args);
	}
	try {
		return await p.run({ task, args }, signal ? { signal } : {});
	} catch (error) {
		if (signal?.aborted) throw error;
		// A worker that cannot load (no tsx here, a damaged install) must not take the route down.
		if (!(error instanceof Error) || !/Cannot find|ERR_MODULE|worker/i.test(error.message))
			throw error;
		log.error({ err: errorField(error) }, 'engine pool: running inline from now on');
		pool = null;
		await p.destroy().catch(() => undefined);
		return inline(task, args);
	}
}

/**
 * Runs an engine task in the pool, in the team's line. Rejects with {@link EngineBusy} when the
 * line is full and with an `AbortError` when the call's signal aborts first.
 */
export function runEngine<T extends EngineTask>(
	task: T,
	args: EngineArgs<T>,
	call: EngineCall = {},
): Promise<EngineResult<T>> {
	const { signal } = call;
	if (signal?.aborted) return Promise.reject(abortError());
	const team = call.team ?? '';
	const line = lines.get(team) ?? [];
	const slots = Math.max(1, THREADS);
	if (running >= slots || waiting > 0) {
		if (waiting >= MAX_QUEUE) return refuse('queue_full');
		if (line.length >= MAX_TEAM_QUEUE) return refuse('team_share');
	}
	return new Promise<EngineResult<T>>((resolve, reject) => {
		const job: Job = {
			task,
			args,
			team,
			signal,
			queuedAt: performance.now(),
			resolve: resolve as (v: unknown) => void,
			reject,
		};
		if (signal) {
			job.onAbort = () => {
				const l = lines.get(team);
				const at = l?.indexOf(job) ?? -1;
				if (at < 0) return;
				l!.splice(at, 1);
				if (l!.length === 0) lines.delete(team);
				waiting--;
				engineQueueDepth.set(waiting);
				engineCancelled.inc();
				reject(abortError());
			};
			signal.addEventListener('abort', job.onAbort, { once: true });
		}
		line.push(job);
		if (!lines.has(team)) lines.set(team, line);
		waiting++;
		engineQueueDepth.set(waiting);
		pump();
	});
}

/** How the pool stands now (the metrics and the tests read it). */
export const enginePoolState = () => ({
	threads: Math.max(1, THREADS),
	waiting,
	running,
	maxQueue: MAX_QUEUE,
	maxTeamQueue: MAX_TEAM_QUEUE,
});

/** Whether an error is a caller's abort (the client went away). */
export const isAbort = (error: unknown) =>
	error instanceof Error && (error.name === 'AbortError' || error.name === 'AbortSignal');

/** Stops the pool's threads (the server's shutdown). */
export async function stopEnginePool(): Promise<void> {
	const p = pool;
	pool = undefined;
	await p?.destroy();
}
