import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { doc, node } from '../helpers/networks';

/**
 * The engine's line in front of the worker pool, run inline (one slot) so the order of work is
 * observable: bounded, fair between teams, and cancellable while waiting.
 */
type Pool = typeof import('../../src/lib/server/engine/pool');

async function freshPool(env: Record<string, string>): Promise<Pool> {
	vi.resetModules();
	for (const [k, v] of Object.entries(env)) vi.stubEnv(k, v);
	return import('../../src/lib/server/engine/pool');
}

const tiny = () => doc({ nodes: [node('gnd', 'chassis')] });
const diff = (pool: Pool, team: string, signal?: AbortSignal) =>
	pool.runEngine('diffs', { pairs: [{ before: tiny(), after: tiny() }] }, { team, signal });

describe('the engine line', () => {
	beforeEach(() => vi.unstubAllEnvs());
	afterEach(() => vi.unstubAllEnvs());

	it('serves teams in turn: a team that asks once is not kept behind another’s many', async () => {
		const pool = await freshPool({ SAGWISE_ENGINE_THREADS: '0', SAGWISE_ENGINE_QUEUE: '50' });
		const done: string[] = [];
		const asks = [
			...Array.from({ length: 6 }, (_, i) =>
				diff(pool, 'heavy').then(() => done.push(`heavy${i}`)),
			),
			diff(pool, 'light').then(() => done.push('light')),
		];
		await Promise.all(asks);
		// The first heavy one started at once; the light team's one goes next in turn, not 7th.
		expect(done.indexOf('light')).toBeLessThanOrEqual(2);
		expect(done.filter((d) => d.startsWith('heavy'))).toEqual(
			Array.from({ length: 6 }, (_, i) => `heavy${i}`),
		);
	});

	it('refuses past its bound with a retry time, and past a team’s share while others wait', async () => {
		const pool = await freshPool({
			SAGWISE_ENGINE_THREADS: '0',
			SAGWISE_ENGINE_QUEUE: '4',
			SAGWISE_ENGINE_TEAM_QUEUE: '2',
		});
		const first = diff(pool, 'a'); // starts at once (one slot)
		const waiting = [diff(pool, 'a'), diff(pool, 'a')];
		// Team a has its two waiting: a third is refused while team b still gets in.
		await expect(diff(pool, 'a')).rejects.toBeInstanceOf(pool.EngineBusy);
		const others = [diff(pool, 'b'), diff(pool, 'c')];
		// Four wait in all: anyone else is refused, with a Retry-After of at least a second.
		const refused = await diff(pool, 'd').catch((e: unknown) => e);
		expect(refused).toBeInstanceOf(pool.EngineBusy);
		expect((refused as InstanceType<Pool['EngineBusy']>).retryAfterS).toBeGreaterThanOrEqual(1);
		await Promise.all([first, ...waiting, ...others]);
		// Once the line has drained, work is taken again.
		await expect(diff(pool, 'd')).resolves.toHaveLength(1);
		expect(pool.enginePoolState()).toMatchObject({ waiting: 0, running: 0 });
	});

	it('drops a waiting computation whose caller went away, and never runs it', async () => {
		const pool = await freshPool({ SAGWISE_ENGINE_THREADS: '0' });
		const first = diff(pool, 'a');
		const controller = new AbortController();
		const gone = diff(pool, 'a', controller.signal);
		controller.abort();
		await expect(gone).rejects.toMatchObject({ name: 'AbortError' });
		expect(pool.enginePoolState().waiting).toBe(0);
		await first;
		// An already aborted signal is refused without joining the line.
		await expect(diff(pool, 'a', AbortSignal.abort())).rejects.toMatchObject({
			name: 'AbortError',
		});
	});
});
