import { type ChildProcess, execFileSync, spawn } from 'node:child_process';
import net from 'node:net';
import { sql } from 'kysely';
import { afterAll, describe, expect, it } from 'vitest';
import { ensureCluster } from '../../../db/cluster';
import { createDb } from '../../../src/lib/server/db/client';
import { TEST_CLUSTER } from '../../helpers/pg-global-setup';

const PORTS = { app: 4395, smtp: 2535, s3: 4579 };

const portFree = (port: number) =>
	new Promise<boolean>((resolve) => {
		const probe = net.createServer().once('error', () => resolve(false));
		probe.listen(port, '127.0.0.1', () => probe.close(() => resolve(true)));
	});

describe('npm start when its server is killed', () => {
	let start: ChildProcess | undefined;
	let dbName = '';
	afterAll(async () => {
		if (start && start.exitCode === null) start.kill('SIGKILL');
		const admin = createDb((await ensureCluster(TEST_CLUSTER)).url(), 1);
		await sql`drop database if exists ${sql.id(dbName)} with (force)`.execute(admin);
		await admin.destroy();
	});

	it('stops its file and mail fakes and frees every port it took', async () => {
		const cluster = await ensureCluster(TEST_CLUSTER);
		dbName = `start_${Date.now()}`;
		const admin = createDb(cluster.url(), 1);
		await sql`create database ${sql.id(dbName)} template ${sql.id(`sagwise_template_${process.env.SAGWISE_TEST_RUN}`)}`.execute(
			admin,
		);
		await admin.destroy();

		start = spawn(process.execPath, ['--import', 'tsx', 'src/cli/start.ts'], {
			env: {
				...process.env,
				PORT: String(PORTS.app),
				DATABASE_URL: cluster.url(dbName),
				SAGWISE_SMTP_PORT: String(PORTS.smtp),
				SAGWISE_S3_PORT: String(PORTS.s3),
				AUTH_SECRET: 'test-secret-not-for-production-0123456789',
			},
			stdio: ['ignore', 'pipe', 'pipe'],
		});
		let out = '';
		start.stdout!.on('data', (d) => (out += d));
		start.stderr!.on('data', (d) => (out += d));
		const deadline = Date.now() + 60_000;
		while (!/ready in/.test(out) && Date.now() < deadline && start.exitCode === null)
			await new Promise((r) => setTimeout(r, 200));
		expect(out).toMatch(/ready in/);
		for (const port of Object.values(PORTS))
			expect(await portFree(port), `port ${port} taken while running`).toBe(false);

		// The server is the start command's child running the HTTP front.
		const serverPid = execFileSync('pgrep', ['-P', String(start.pid), '-f', 'serve.mjs'], {
			encoding: 'utf8',
		})
			.trim()
			.split('\n')[0]!;
		process.kill(Number(serverPid), 'SIGKILL');
		const exited = await new Promise<boolean>((resolve) => {
			const timer = setTimeout(() => resolve(false), 20_000);
			start!.once('exit', () => {
				clearTimeout(timer);
				resolve(true);
			});
		});
		expect(exited, `npm start did not exit:\n${out.slice(-2000)}`).toBe(true);
		for (const port of Object.values(PORTS))
			expect(await portFree(port), `port ${port} still taken`).toBe(true);
	}, 120_000);
});
