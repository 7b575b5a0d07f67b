/**
 * `npm run bench:body`: the server's memory while hostile clients stream 300 MB bodies at it.
 * Starts the built app behind its HTTP front (services pointed at closed ports: the bodies are
 * refused before any service is asked), streams each body, and samples the server's resident
 * memory (VmRSS) every 20 ms. Flat means the growth stays near the route's own limit, not 300 MB.
 */
import http from 'node:http';
import { readFileSync } from 'node:fs';
import { startAppServer } from '../helpers/app-server';

const PORT = Number(process.env.SAGWISE_BENCH_PORT ?? 4396);
const TOTAL = 300 * 1024 * 1024;

const rssMb = (pid: number) =>
	Number(/VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))?.[1] ?? 0) / 1024;

function stream(
	path: string,
	declareLength: boolean,
	contentType: string,
): Promise<{ status: number; sentMb: number }> {
	return new Promise((resolve) => {
		let sent = 0;
		let status = 0;
		const headers: Record<string, string> = {
			'content-type': contentType,
			origin: `http://127.0.0.1:${PORT}`,
		};
		if (declareLength) headers['content-length'] = String(TOTAL);
		else headers['transfer-encoding'] = 'chunked';
		const req = http.request(
			{ host: '127.0.0.1', port: PORT, path, method: 'POST', headers },
			(res) => {
				status = res.statusCode ?? 0;
				res.resume();
				res.on('end', () => finish());
			},
		);
		let done = false;
		const finish = () => {
			if (done) return;
			done = true;
			req.destroy();
			resolve({ status, sentMb: Math.round(sent / 1024 / 1024) });
		};
		req.on('error', finish);
		const chunk = Buffer.alloc(256 * 1024, 0x61);
		const pump = () => {
			while (sent < TOTAL && !done) {
				sent += chunk.length;
				if (!req.write(chunk)) return void req.once('drain', pump);
			}
			if (!done) req.end();
		};
		pump();
	});
}

const server = await startAppServer(
	PORT,
	{
		DATABASE_URL: 'postgres://postgres@127.0.0.1:1/none',
		SMTP_URL: 'smtp://127.0.0.1:1',
		S3_ENDPOINT: 'http://127.0.0.1:1',
		SAGWISE_S3_TIMEOUT_MS: '500',
	},
	{ healthy: false },
);
const pid = server.process.pid!;
try {
	const cases: [string, string, boolean, string][] = [
		['sign-up JSON, chunked (limit 2 MB)', '/api/account/sign-up', false, 'application/json'],
		['sign-up JSON, declared 300 MB', '/api/account/sign-up', true, 'application/json'],
		[
			'password sign-in form, chunked (limit 64 KB)',
			'/api/auth/callback/credentials',
			false,
			'application/x-www-form-urlencoded',
		],
		[
			'team route JSON, chunked, anonymous',
			'/api/teams/00000000-0000-4000-8000-000000000000/events',
			false,
			'application/json',
		],
	];
	console.log(`server pid ${pid}, resident memory at rest ${rssMb(pid).toFixed(1)} MB`);
	console.log('case | status | client got to send | server RSS before → peak (growth)');
	for (const [label, path, declared, type] of cases) {
		const before = rssMb(pid);
		let peak = before;
		const timer = setInterval(() => (peak = Math.max(peak, rssMb(pid))), 20);
		const r = await stream(path, declared, type);
		await new Promise((res) => setTimeout(res, 200));
		clearInterval(timer);
		console.log(
			`${label} | ${r.status} | ${r.sentMb} MB of 300 | ${before.toFixed(1)} → ${peak.toFixed(1)} MB (+${(peak - before).toFixed(1)} MB)`,
		);
	}
} finally {
	await server.stop();
}
