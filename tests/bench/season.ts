/**
 * `npm run bench:season`: the product at a season's volume. On the bench cluster it adds, once,
 * `SAGWISE_BENCH_SEASON_TEAMS` (10) invented seasons (db/season.ts: 12 vehicles × 60 revisions, 40
 * events, 1,500 runs, 500 of them logged with 3,000 samples, 30 plans; samples without files),
 * then, as the first season team's captain:
 *
 * - first views (server time, each page rendered afresh) of the team page, a vehicle's runs, its
 *   history and the events calendar: target < 100 ms each, and what each sends;
 * - 20 logger uploads of 3,000 samples: median < 150 ms;
 * - the team backup's streamed export while health is polled: memory growth < 100 MB, health p99
 *   < 200 ms.
 *
 * Needs `npm run build` first.
 */
import { DEMO_PASSWORD } from '../../db/seed';
import { generateSeason } from '../../db/season';
import { HttpSession } from '../helpers/http-session';
import { startBenchApp } from './bench-app';
import { pct, rssMb, watchServer } from './watch';

const PORT = Number(process.env.SAGWISE_BENCH_PORT ?? 4394);
const TEAMS = Number(process.env.SAGWISE_BENCH_SEASON_TEAMS ?? 10);

let captainEmail = '';
const { server, stop } = await startBenchApp(PORT, async (db) => {
	const have = await db
		.selectFrom('team')
		.select('name')
		.where('name', 'like', 'Season Test Team %')
		.execute();
	for (let i = have.length + 1; i <= TEAMS; i++) {
		const t0 = performance.now();
		await generateSeason(db, { index: i });
		console.log(
			`season team ${i}/${TEAMS} made in ${((performance.now() - t0) / 1000).toFixed(1)} s`,
		);
	}
	const captain = await db
		.selectFrom('membership as m')
		.innerJoin('team as t', 't.id', 'm.team_id')
		.innerJoin('User as u', 'u.id', 'm.user_id')
		.select('u.email')
		.where('t.name', 'like', 'Season Test Team 1 %')
		.where('m.role', '=', 'captain')
		.executeTakeFirstOrThrow();
	captainEmail = captain.email;
});

const rss = () => rssMb(server);
const rows: [string, string, string, boolean][] = [];

try {
	const captain = new HttpSession(server.url);
	await captain.signInWithPassword(captainEmail, DEMO_PASSWORD);
	const teams = (await (await captain.fetch('/api/teams')).json()) as { id: string }[];
	const teamId = teams[0]!.id;
	const vehicles = (await (await captain.fetch(`/api/teams/${teamId}/vehicles`)).json()) as {
		id: string;
	}[];
	const v = vehicles[0]!;
	const pages: Record<string, string> = {
		'team page': `/teams/${teamId}`,
		'runs of a vehicle': `/teams/${teamId}/vehicles/${v.id}/runs`,
		'history of a vehicle': `/teams/${teamId}/vehicles/${v.id}/history`,
		'events calendar': `/teams/${teamId}/events`,
		'runs API (a page)': `/api/teams/${teamId}/runs`,
	};
	// One view each to load the server's modules (not this team's data: each is then asked afresh).
	for (const url of Object.values(pages)) await (await captain.fetch(`${url}?warm`)).arrayBuffer();
	for (const [name, url] of Object.entries(pages)) {
		const times: number[] = [];
		let bytes = 0;
		for (let i = 0; i < 3; i++) {
			const t0 = performance.now();
			const res = await captain.fetch(`${url}${url.includes('?') ? '&' : '?'}afresh=${i}`);
			bytes = (await res.arrayBuffer()).byteLength;
			times.push(performance.now() - t0);
		}
		const first = times[0]!;
		rows.push([
			`${name} (first view)`,
			`${first.toFixed(0)} ms, ${(bytes / 1024).toFixed(0)} KB`,
			'< 100 ms',
			first < 100,
		]);
	}

	// Logger uploads of 3,000 samples.
	// The second vehicle's runs (the generator logs every third run: the first vehicle's all are).
	const runs = (await (
		await captain.fetch(`/api/teams/${teamId}/runs?vehicleId=${vehicles[1]!.id}&limit=60`)
	).json()) as { id: string; hasLogger: boolean }[];
	const csv = `time_s,volts,amps\n${Array.from({ length: 3000 }, (_, i) => `${(i / 20).toFixed(2)},${(i > 600 && i < 1800 ? 11.7 : 12.8).toFixed(3)},${i > 600 && i < 1800 ? 640 : 12}`).join('\n')}\n`;
	const uploads: number[] = [];
	// Runs without one first; once earlier bench runs have filled those, uploads replace a file
	// (the same work plus clearing the old samples).
	const targets = [...runs.filter((x) => !x.hasLogger), ...runs.filter((x) => x.hasLogger)];
	for (const r of targets.slice(0, 20)) {
		const form = new FormData();
		form.set('file', new Blob([csv], { type: 'text/csv' }), 'logger.csv');
		form.set('timeColumn', 'time_s');
		form.set('voltsColumn', 'volts');
		form.set('ampsColumn', 'amps');
		const t0 = performance.now();
		const res = await captain.fetch(`/api/teams/${teamId}/runs/${r.id}/logger`, {
			method: 'POST',
			body: form,
		});
		await res.arrayBuffer();
		if (res.status !== 201) throw new Error(`upload answered ${res.status}`);
		uploads.push(performance.now() - t0);
	}
	if (uploads.length === 0) throw new Error('no run without a logger file to upload to');
	const median = pct(uploads, 50);
	rows.push([
		`logger upload, 3,000 samples (median of ${uploads.length})`,
		`${median.toFixed(0)} ms`,
		'< 150 ms',
		median < 150,
	]);

	// The backup's streamed export, with health polled.
	const watch = watchServer(server);
	const t0 = performance.now();
	const res = await captain.fetch(`/api/teams/${teamId}/export`);
	let size = 0;
	const pieces: Uint8Array[] = [];
	for await (const chunk of res.body!) {
		size += (chunk as Uint8Array).byteLength;
		pieces.push(chunk as Uint8Array);
	}
	const took = performance.now() - t0;
	const { health, rss0, peak } = await watch.stop();

	// The same file restored as a new team (how long, and what it costs the server's memory).
	const rssBefore = rss();
	let importPeak = rssBefore;
	let importing = true;
	const watcher = (async () => {
		while (importing) {
			importPeak = Math.max(importPeak, rss());
			await new Promise((r) => setTimeout(r, 100));
		}
	})();
	const form = new FormData();
	form.set('file', new Blob(pieces as BlobPart[], { type: 'application/json' }), 'season.json');
	const i0 = performance.now();
	const imported = await captain.fetch('/api/teams/import', { method: 'POST', body: form });
	await imported.arrayBuffer();
	const importS = (performance.now() - i0) / 1000;
	importing = false;
	await watcher;
	rows.push([
		'backup export',
		`${(size / 1048576).toFixed(1)} MB in ${(took / 1000).toFixed(1)} s`,
		'streams',
		res.status === 200,
	]);
	rows.push([
		'memory growth during export',
		`${(peak - rss0).toFixed(0)} MB`,
		'< 100 MB',
		peak - rss0 < 100,
	]);
	rows.push([
		'health p99 during export',
		`${pct(health, 99).toFixed(0)} ms`,
		'< 200 ms',
		pct(health, 99) < 200,
	]);

	rows.push([
		'backup import (the same file)',
		`${imported.status} in ${importS.toFixed(1)} s`,
		'< 60 s',
		imported.status === 201 && importS < 60,
	]);
	rows.push([
		'memory growth during import',
		`${(importPeak - rssBefore).toFixed(0)} MB`,
		'< 200 MB',
		importPeak - rssBefore < 200,
	]);

	console.log(`\nA season's volume (${TEAMS} season teams in the database)\n`);
	for (const [name, value, target, ok] of rows)
		console.log(`${ok ? '✓' : '✗'} ${name.padEnd(48)} ${value.padStart(20)}   target ${target}`);
	if (rows.some((r) => !r[3])) process.exitCode = 1;
} finally {
	await stop();
}
