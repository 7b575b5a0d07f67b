import { readFileSync } from 'node:fs';
import type { AppServer } from '../helpers/app-server';

/** The server process's resident memory (MB), from /proc. */
export const rssMb = (server: AppServer) =>
	Number(/VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${server.process.pid}/status`, 'utf8'))![1]) /
	1024;

/** The p-th percentile of `xs` (nearest rank). */
export const pct = (xs: number[], p: number) => {
	const s = [...xs].sort((a, b) => a - b);
	return s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)] ?? 0;
};

/**
 * Polls `/api/health` every 50 ms and samples the server's memory while a bench's work runs;
 * `stop()` answers the health latencies (ms), the memory at the start and its peak (MB).
 */
export function watchServer(server: AppServer) {
	const rss0 = rssMb(server);
	let peak = rss0;
	const health: number[] = [];
	let polling = true;
	const poller = (async () => {
		while (polling) {
			const t0 = performance.now();
			await (await fetch(`${server.url}/api/health`)).arrayBuffer();
			health.push(performance.now() - t0);
			peak = Math.max(peak, rssMb(server));
			await new Promise((r) => setTimeout(r, 50));
		}
	})();
	return {
		stop: async () => {
			polling = false;
			await poller;
			return { health, rss0, peak };
		},
	};
}
