/**
 * `npm run bench:http`: the server side by side, as a user meets it. Starts the built app behind
 * its HTTP front on a cluster of its own (`.data/bench-pg`, seeded with the demo team), signs in,
 * then runs autocannon (10 connections, 10 s) against each route, interleaved over three rounds,
 * and prints requests per second, p99 latency and each route's ratio to `/api/health` measured in
 * the same round. Needs `npm run build` first.
 *
 * Targets (ratio to health; p99 at 10 connections): report API ≥ 0.5, plan comparison (repeat
 * view) ≥ 0.3, build page ≥ 0.25, team page ≥ 0.4, each p99 < 100 ms; the two pages rendered
 * afresh (a query string skips the kept copy, as after every change): team ≥ 0.5, build ≥ 0.3 (a
 * throughput target only: at 10 connections on two cores their p99 is printed, not judged).
 */
import autocannon from 'autocannon';
import { DEMO_PASSWORD, DEMO_USERS } from '../../db/seed';
import { startBenchApp } from './bench-app';
import { HttpSession } from '../helpers/http-session';

const PORT = Number(process.env.SAGWISE_BENCH_PORT ?? 4394);
const SECONDS = Number(process.env.SAGWISE_BENCH_SECONDS ?? 10);
const ROUNDS = Number(process.env.SAGWISE_BENCH_ROUNDS ?? 3);
const CONNECTIONS = 10;

const { server, stop } = await startBenchApp(PORT);

try {
	const session = new HttpSession(server.url);
	await session.signInWithPassword(DEMO_USERS[0].email, DEMO_PASSWORD);
	const cookie = (session as unknown as { cookies: Map<string, string> }).cookies;
	const cookieHeader = [...cookie].map(([k, v]) => `${k}=${v}`).join('; ');
	const json = async <T>(p: string) => (await (await session.fetch(p)).json()) as T;
	const [team] = await json<Array<{ id: string }>>('/api/teams');
	const vehicles = await json<Array<{ id: string; name: string; headRevisionId: string }>>(
		`/api/teams/${team!.id}/vehicles`,
	);
	const oak = vehicles.find((v) => v.name === 'Old Oak') ?? vehicles[0]!;
	const plans = await json<Array<{ id: string; name: string }>>(
		`/api/teams/${team!.id}/vehicles/${oak.id}/plans`,
	);
	// The demo's own plans (at most three compare at once): not the heavy bench's plans at the limits.
	const comparable = plans.filter((p) => !p.name.startsWith('At the limits')).slice(0, 3);
	const routes: Record<string, string> = {
		health: '/api/health',
		'vehicles list API': `/api/teams/${team!.id}/vehicles`,
		'team page': `/teams/${team!.id}`,
		'report API': `/api/teams/${team!.id}/vehicles/${oak.id}/revisions/${oak.headRevisionId}/report`,
		'plan comparison (repeat view)': `/api/teams/${team!.id}/vehicles/${oak.id}/plans/compare?plans=${comparable.map((p) => p.id).join(',')}`,
		'build page': `/teams/${team!.id}/vehicles/${oak.id}`,
		// A query string bypasses the kept pages: what each view costs after a change.
		'team page, rendered afresh': `/teams/${team!.id}?afresh`,
		'build page, rendered afresh': `/teams/${team!.id}/vehicles/${oak.id}?afresh`,
	};
	const TARGETS: Record<string, number> = {
		'report API': 0.5,
		'plan comparison (repeat view)': 0.3,
		'build page': 0.25,
		'team page': 0.4,
		'team page, rendered afresh': 0.5,
		'build page, rendered afresh': 0.3,
	};

	const run = (url: string) =>
		new Promise<autocannon.Result>((resolve, reject) =>
			autocannon(
				{
					url: `${server.url}${url}`,
					connections: CONNECTIONS,
					duration: SECONDS,
					headers: { cookie: cookieHeader, 'accept-encoding': 'gzip, br' },
				},
				(err, result) => (err ? reject(err) : resolve(result)),
			),
		);

	// One warm-up request each (the first view of a comparison computes it; repeat views are what is measured).
	for (const url of Object.values(routes)) await session.fetch(url);

	const results: Record<string, { rps: number[]; p99: number[]; ratio: number[]; errors: number }> =
		{};
	for (let round = 1; round <= ROUNDS; round++) {
		let healthRps = 1;
		for (const [name, url] of Object.entries(routes)) {
			const r = await run(url);
			const rps = r.requests.average;
			if (name === 'health') healthRps = rps;
			const entry = (results[name] ??= { rps: [], p99: [], ratio: [], errors: 0 });
			entry.rps.push(rps);
			entry.p99.push(r.latency.p99);
			entry.ratio.push(rps / healthRps);
			entry.errors += r.errors + r.non2xx;
			console.log(
				`round ${round}: ${name.padEnd(30)} ${rps.toFixed(0).padStart(6)} req/s  p99 ${String(r.latency.p99).padStart(5)} ms`,
			);
		}
	}
	const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
	console.log(
		`\n${'route'.padEnd(32)}${'req/s'.padStart(8)}${'p99 ms'.padStart(9)}${'× health'.padStart(10)}  target`,
	);
	for (const [name, r] of Object.entries(results)) {
		const ratio = median(r.ratio);
		const p99 = median(r.p99);
		const target = TARGETS[name];
		const judgesP99 = !name.includes('afresh');
		const verdict =
			target === undefined
				? ''
				: `${ratio >= target && (!judgesP99 || p99 < 100) ? 'meets' : 'MISSES'} ≥ ${target}${judgesP99 ? ', p99 < 100' : ''}`;
		console.log(
			`${name.padEnd(32)}${median(r.rps).toFixed(0).padStart(8)}${String(p99).padStart(9)}${ratio.toFixed(3).padStart(10)}  ${verdict}${r.errors ? `  (${r.errors} errors/non-2xx)` : ''}`,
		);
	}
} finally {
	await stop();
}
