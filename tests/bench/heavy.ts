/**
 * `npm run bench:heavy`: the heaviest plan a member can make, viewed by many at once. Starts the
 * built app (its own cluster, demo team), saves a plan at the schema's limits (1,000 cables) on
 * the flagship vehicle through the API, then, while `/api/health` is polled every 50 ms:
 *
 * - ten concurrent first views of the plan's page, and four distinct uncached comparisons of the
 *   plan with the build (four engine speeds);
 * - then a repeat view of the page and of one comparison.
 *
 * The server is warmed first (the demo's plan pages and comparisons, once each), as a running
 * server is. Targets: health p99 < 200 ms and max < 1 s meanwhile; the server's memory (RSS) grows < 300 MB;
 * every view answers within 60 s; a repeat view < 500 ms. Needs `npm run build` first.
 */
import { DEMO_PASSWORD, DEMO_USERS } from '../../db/seed';
import { HttpSession } from '../helpers/http-session';
import { startBenchApp } from './bench-app';
import { heavyValidNetwork } from './fixtures';
import { pct, watchServer } from './watch';

const PORT = Number(process.env.SAGWISE_BENCH_PORT ?? 4394);
const { server, stop } = await startBenchApp(PORT);

const timed = async (f: () => Promise<Response>) => {
	const t0 = performance.now();
	const res = await f();
	await res.arrayBuffer();
	return { status: res.status, ms: performance.now() - t0 };
};

try {
	const member = new HttpSession(server.url);
	await member.signInWithPassword(DEMO_USERS[1].email, DEMO_PASSWORD);
	const viewer = new HttpSession(server.url);
	await viewer.signInWithPassword(DEMO_USERS[2].email, DEMO_PASSWORD);
	const [team] = (await (await member.fetch('/api/teams')).json()) as { id: string }[];
	const vehicles = (await (await member.fetch(`/api/teams/${team!.id}/vehicles`)).json()) as {
		id: string;
		name: string;
	}[];
	const oak = vehicles.find((v) => v.name === 'Old Oak') ?? vehicles[0]!;
	const made = await member.fetch(`/api/teams/${team!.id}/vehicles/${oak.id}/plans`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify({
			name: `At the limits ${Date.now()}`,
			document: heavyValidNetwork(1000),
		}),
	});
	if (made.status !== 201) throw new Error(`plan not made: ${made.status} ${await made.text()}`);
	const plan = (await made.json()) as { id: string };
	const page = `/teams/${team!.id}/vehicles/${oak.id}/plans/${plan.id}`;
	const compare = (rpm: number) =>
		`/api/teams/${team!.id}/vehicles/${oak.id}/plans/compare?plans=${plan.id}&engineRpm=${rpm}`;

	// A server that has served pages before (its modules loaded): the demo's own plans, once each.
	const demoPlans = (await (
		await viewer.fetch(`/api/teams/${team!.id}/vehicles/${oak.id}/plans`)
	).json()) as { id: string }[];
	for (const p of demoPlans.filter((x) => x.id !== plan.id)) {
		await (await viewer.fetch(`/teams/${team!.id}/vehicles/${oak.id}/plans/${p.id}`)).arrayBuffer();
		await (
			await viewer.fetch(`/api/teams/${team!.id}/vehicles/${oak.id}/plans/compare?plans=${p.id}`)
		).arrayBuffer();
	}

	const watch = watchServer(server);
	const t0 = performance.now();
	const views = await Promise.all([
		...Array.from({ length: 10 }, () => timed(() => viewer.fetch(page))),
		...[1000, 2000, 3000, 4000].map((rpm) => timed(() => viewer.fetch(compare(rpm)))),
	]);
	const wall = performance.now() - t0;
	const { health, rss0, peak } = await watch.stop();
	if (process.env.SAGWISE_BENCH_TRACE) console.log(health.map((h) => h.toFixed(0)).join(' '));
	const repeatPage = await timed(() => viewer.fetch(page));
	const repeatCompare = await timed(() => viewer.fetch(compare(2000)));

	const p99 = pct(health, 99);
	const max = Math.max(...health);
	const grew = peak - rss0;
	const slowest = Math.max(...views.map((v) => v.ms));
	const rows: [string, string, string, boolean][] = [
		['health p99 meanwhile', `${p99.toFixed(0)} ms`, '< 200 ms', p99 < 200],
		['health max meanwhile', `${max.toFixed(0)} ms`, '< 1000 ms', max < 1000],
		['memory growth (RSS)', `${grew.toFixed(0)} MB`, '< 300 MB', grew < 300],
		['slowest view', `${(slowest / 1000).toFixed(2)} s`, '< 60 s', slowest < 60_000],
		[
			'statuses',
			[...new Set(views.map((v) => v.status))].join(','),
			'200 (503 only past the line)',
			views.every((v) => v.status === 200 || v.status === 503),
		],
		['repeat page view', `${repeatPage.ms.toFixed(0)} ms`, '< 500 ms', repeatPage.ms < 500],
		[
			'repeat comparison',
			`${repeatCompare.ms.toFixed(0)} ms`,
			'< 500 ms',
			repeatCompare.ms < 500 && repeatCompare.status === 200,
		],
	];
	console.log(
		`\nHeavy plan (1,000 cables): 10 page views + 4 comparisons in ${(wall / 1000).toFixed(1)} s; ${health.length} health checks\n`,
	);
	for (const [name, value, target, ok] of rows)
		console.log(`${ok ? '✓' : '✗'} ${name.padEnd(24)} ${value.padStart(12)}   target ${target}`);
	console.log(
		`\nComparisons: ${views
			.slice(10)
			.map((v) => `${v.status} in ${(v.ms / 1000).toFixed(2)} s`)
			.join(', ')}`,
	);
	if (rows.some((r) => !r[3])) process.exitCode = 1;
} finally {
	await stop();
}
