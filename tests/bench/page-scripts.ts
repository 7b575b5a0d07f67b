/**
 * `npm run bench:scripts`: how much script each page makes a browser load, gzip-compressed, signed
 * in as the demo captain. Opens each page in Debian's chromium against the built app, waits for
 * the network to settle, and adds up every JavaScript response the page itself loaded (modules,
 * preloads and the chunks they import; the engine's worker is counted apart, since it loads off
 * the main thread and only when the workbench needs it). Also says whether chart.js and zod came
 * down. Needs `npm run build` first.
 *
 * Budgets: sign-in and teams ≤ 40 KB, the build page ≤ 150 KB.
 */
import { gzipSync } from 'node:zlib';
import { DEMO_PASSWORD, DEMO_USERS } from '../../db/seed';
import { openBrowser } from '../helpers/browser';
import { startBenchApp } from './bench-app';

const PORT = Number(process.env.SAGWISE_BENCH_PORT ?? 4395);
const BUDGET_KB: Record<string, number> = { 'sign-in': 40, teams: 40, 'build page': 150 };

const { server, stop } = await startBenchApp(PORT);
const b = await openBrowser();
try {
	const p = b.page;
	const seen: { url: string; gzip: number; worker: boolean; text: string }[] = [];
	const record = async (res: import('playwright-core').Response) => {
		const type = res.headers()['content-type'] ?? '';
		if (!type.includes('javascript')) return;
		try {
			const body = await res.body();
			seen.push({
				url: res.url(),
				gzip: gzipSync(body).length,
				worker: /\.worker[-.]/.test(res.url()),
				text: body.toString('utf8'),
			});
		} catch {
			// A response the page navigated away from: not part of this page.
		}
	};
	p.on('response', (r) => void record(r));
	b.context.on('serviceworker', () => undefined);

	const measure = async (name: string, open: () => Promise<void>) => {
		seen.length = 0;
		await open();
		await p.waitForLoadState('networkidle');
		await p.waitForTimeout(500);
		// One count per file: a response can be reported twice (a preload, then the import).
		const unique = [...new Map(seen.map((s) => [s.url, s])).values()];
		seen.length = 0;
		seen.push(...unique);
		const main = seen.filter((s) => !s.worker);
		const kb = main.reduce((t, s) => t + s.gzip, 0) / 1024;
		const workerKb = seen.filter((s) => s.worker).reduce((t, s) => t + s.gzip, 0) / 1024;
		const all = main.map((s) => s.text).join('\n');
		if (process.env.SAGWISE_BENCH_FILES === '1')
			for (const s of [...main].sort((a, b) => b.gzip - a.gzip))
				console.log(`  ${name}: ${(s.gzip / 1024).toFixed(1)} KB ${new URL(s.url).pathname}`);
		return {
			page: name,
			'script KB (gzip)': kb.toFixed(1),
			budget: BUDGET_KB[name] ? `≤ ${BUDGET_KB[name]}` : '',
			within: BUDGET_KB[name] ? (kb <= BUDGET_KB[name]! ? 'yes' : 'NO') : '',
			files: main.length,
			'worker KB': workerKb.toFixed(1),
			'chart.js': /Chart\.js v\d|chartjs|registry\.plugins/.test(all) ? 'yes' : 'no',
			zod: /ZodError|\$ZodType|zod\/v4/.test(all) ? 'yes' : 'no',
		};
	};

	const rows = [];
	rows.push(await measure('sign-in', async () => void (await p.goto(`${server.url}/sign-in`))));
	await p.getByLabel('E-mail').fill(DEMO_USERS[0].email);
	await p.getByLabel('Password').fill(DEMO_PASSWORD);
	await p.getByRole('button', { name: 'Sign in' }).click();
	await p.waitForURL(`${server.url}/teams`);
	rows.push(await measure('teams', async () => void (await p.goto(`${server.url}/teams`))));
	const team = await p.getByRole('link', { name: /Harbour Street/ }).getAttribute('href');
	rows.push(await measure('team page', async () => void (await p.goto(`${server.url}${team}`))));
	const oak = await p
		.getByRole('link', { name: 'Old Oak', exact: true })
		.first()
		.getAttribute('href');
	rows.push(await measure('build page', async () => void (await p.goto(`${server.url}${oak}`))));
	rows.push(await measure('runs', async () => void (await p.goto(`${server.url}${oak}/runs`))));
	rows.push(await measure('plans', async () => void (await p.goto(`${server.url}${oak}/plans`))));
	rows.push(
		await measure('history', async () => void (await p.goto(`${server.url}${oak}/history`))),
	);
	console.table(rows);
	const over = rows.filter((r) => r.within === 'NO');
	console.log(
		over.length === 0 ? 'every budget met' : `over budget: ${over.map((r) => r.page).join(', ')}`,
	);
} finally {
	await b.close();
	await stop();
}
