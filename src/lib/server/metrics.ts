import { Counter, collectDefaultMetrics, Gauge, Histogram, Registry } from 'prom-client';

/**
 * The server's Prometheus metrics, read at `/api/metrics` with the operator's token. One registry
 * for this process; each metric has a small, fixed set of labels (routes by their pattern, never
 * by the ids inside a path).
 */
export const registry = new Registry();
collectDefaultMetrics({ register: registry, prefix: 'sagwise_process_' });

export const httpDuration = new Histogram({
	name: 'sagwise_http_request_duration_seconds',
	help: 'Time to answer a request, by route pattern, method and status class',
	labelNames: ['route', 'method', 'status'] as const,
	buckets: [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60],
	registers: [registry],
});

export const engineQueueDepth = new Gauge({
	name: 'sagwise_engine_queue_depth',
	help: 'Engine computations waiting for a worker thread',
	registers: [registry],
});

export const engineRunning = new Gauge({
	name: 'sagwise_engine_running',
	help: 'Engine computations running in worker threads',
	registers: [registry],
});

export const engineWait = new Histogram({
	name: 'sagwise_engine_queue_wait_seconds',
	help: 'Time an engine computation waited for a worker thread, by task',
	labelNames: ['task'] as const,
	buckets: [0.001, 0.005, 0.01, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30],
	registers: [registry],
});

export const engineRun = new Histogram({
	name: 'sagwise_engine_run_seconds',
	help: 'Time an engine computation ran in a worker thread, by task and outcome',
	labelNames: ['task', 'outcome'] as const,
	buckets: [0.001, 0.005, 0.01, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30],
	registers: [registry],
});

export const engineRefused = new Counter({
	name: 'sagwise_engine_refused_total',
	help: 'Engine computations refused because the queue was full (answered 503), by reason',
	labelNames: ['reason'] as const,
	registers: [registry],
});

export const engineCancelled = new Counter({
	name: 'sagwise_engine_cancelled_total',
	help: 'Engine computations cancelled because every client waiting for them had gone',
	registers: [registry],
});

export const cacheRequests = new Counter({
	name: 'sagwise_cache_requests_total',
	help: 'Lookups in the server caches, by cache and result (hit, miss, shared: joined a computation under way)',
	labelNames: ['cache', 'result'] as const,
	registers: [registry],
});

/** Gauges read when scraped (pool sizes, queue counts), registered by the module that knows them. */
export function gaugeOnScrape(
	name: string,
	help: string,
	read: () => number | Promise<number>,
): void {
	if (registry.getSingleMetric(name)) registry.removeSingleMetric(name);
	new Gauge({
		name,
		help,
		registers: [registry],
		async collect() {
			try {
				this.set(await read());
			} catch {
				// A source that cannot answer now (the database down) leaves the gauge unset, not the scrape failed.
				this.reset();
			}
		},
	});
}
