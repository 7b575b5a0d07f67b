import { type ChildProcess, spawn } from 'node:child_process';

export interface AppServer {
	url: string;
	process: ChildProcess;
	/** Everything the server wrote to stderr so far. */
	stderr: () => string;
	/** The last 200 kB the server wrote to stdout (its JSON log lines, when LOG_LEVEL lets them out). */
	stdout: () => string;
	stop: () => Promise<void>;
}

/** The built app behind its HTTP front (src/cli/serve.ts), as `npm start` runs it, on a test port. */
export async function startAppServer(
	port: number,
	env: Record<string, string>,
	opts: { healthy?: boolean } = {},
): Promise<AppServer> {
	const url = `http://127.0.0.1:${port}`;
	const child = spawn(process.execPath, ['dist/serve.mjs'], {
		env: {
			...process.env,
			HOST: '127.0.0.1',
			PORT: String(port),
			AUTH_SECRET: 'test-secret-not-for-production-0123456789',
			AUTH_TRUST_HOST: 'true',
			PUBLIC_URL: url,
			// Served as in production (React's production build), whatever the test runner's NODE_ENV.
			NODE_ENV: 'production',
			...env,
		},
		stdio: ['ignore', 'pipe', 'pipe'],
	});
	let err = '';
	let out = '';
	child.stdout!.on('data', (d: Buffer) => {
		out = (out + d.toString()).slice(-200_000);
	});
	child.stderr!.on('data', (d: Buffer) => {
		err = (err + d.toString()).slice(-200_000);
		if (process.env.SAGWISE_TEST_SERVER_LOG) process.stderr.write(d);
	});
	const deadline = Date.now() + 30_000;
	for (;;) {
		try {
			const res = await fetch(`${url}/api/health`);
			// Some callers start it with its services away on purpose: any answer then means it is up.
			if (res.ok || opts.healthy === false) break;
		} catch {
			// not up yet
		}
		if (Date.now() > deadline || child.exitCode !== null)
			throw new Error(`the test server did not start:\n${err.slice(-4000)}`);
		await new Promise((r) => setTimeout(r, 150));
	}
	return {
		url,
		process: child,
		stderr: () => err,
		stdout: () => out,
		stop: async () => {
			if (child.exitCode !== null) return;
			child.kill('SIGTERM');
			await new Promise((r) => child.once('exit', r));
		},
	};
}

export interface IsolatedApp {
	server: AppServer;
	dbUrl: string;
	outboxDir: string;
	close: () => Promise<void>;
}

/**
 * A server of a test's own, on a seeded copy of the migrated template in the test cluster, with
 * its own mail and file fakes: for tests whose counters (sign-in limits) or faults must not touch
 * the shared test server.
 */
export async function startIsolatedApp(
	port: number,
	env: Record<string, string> = {},
): Promise<IsolatedApp> {
	const { mkdtempSync } = await import('node:fs');
	const { tmpdir } = await import('node:os');
	const path = await import('node:path');
	const { sql } = await import('kysely');
	const { ensureCluster } = await import('../../db/cluster');
	const { seedDemo } = await import('../../db/seed');
	const { startSmtpFake } = await import('../../src/cli/smtp-fake');
	const { startS3Fake } = await import('../../src/cli/s3-fake');
	const { createDb } = await import('../../src/lib/server/db/client');
	const { TEST_CLUSTER } = await import('./pg-global-setup');
	const cluster = await ensureCluster(TEST_CLUSTER);
	const name = `iso_${port}_${Date.now()}`;
	const admin = createDb(cluster.url(), 1);
	await sql`create database ${sql.id(name)} template ${sql.id(`sagwise_template_${process.env.SAGWISE_TEST_RUN}`)}`.execute(
		admin,
	);
	const db = createDb(cluster.url(name), 1);
	await seedDemo(db);
	await db.destroy();
	const outboxDir = mkdtempSync(path.join(tmpdir(), 'sagwise-iso-mail-'));
	const smtp = await startSmtpFake({ port: 0, dir: outboxDir });
	const s3 = await startS3Fake({
		port: 0,
		dir: mkdtempSync(path.join(tmpdir(), 'sagwise-iso-s3-')),
		bucket: 'sagwise-files',
	});
	const server = await startAppServer(port, {
		DATABASE_URL: cluster.url(name),
		SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
		SAGWISE_DEV_OUTBOX: outboxDir,
		S3_ENDPOINT: s3.endpoint,
		S3_BUCKET: 'sagwise-files',
		...env,
	});
	return {
		server,
		dbUrl: cluster.url(name),
		outboxDir,
		close: async () => {
			await server.stop();
			await smtp.close();
			await s3.close();
			await sql`drop database if exists ${sql.id(name)} with (force)`.execute(admin);
			await admin.destroy();
		},
	};
}
