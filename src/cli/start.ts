/**
 * `npm start`: the whole product on one machine. Starts the embedded PostgreSQL cluster (unless
 * DATABASE_URL is set), migrates, seeds the demo scenario into an empty database, builds when the
 * build is missing or stale, and serves on http://127.0.0.1:4321. Ctrl-C stops everything it started.
 */
import { spawn, spawnSync } from 'node:child_process';
import { createDb } from '../lib/server/db/client';
import { DEFAULT_CLUSTER, ensureCluster, stopCluster, ClusterError } from '../../db/cluster';
import { migrateToLatest } from '../../db/migrator';
import { DEMO_PASSWORD, DEMO_USERS, seedIfEmpty } from '../../db/seed';
import { startSmtpFake } from './smtp-fake';
import { startS3Fake } from './s3-fake';
import { buildIsStale } from './build-state';
import { loadOrCreateSecrets } from './secrets';
import { readConfig } from '../lib/server/config';
import { createS3Storage, ensureBucket } from '../lib/server/storage';

const t0 = performance.now();
const log = (line: string) => console.log(`[sagwise] ${line}`);
const cleanups: Array<() => Promise<void> | void> = [];

async function main() {
	const host = process.env.HOST ?? '127.0.0.1';
	const port = Number(process.env.PORT ?? 4321);
	const publicUrl = process.env.PUBLIC_URL ?? `http://${host}:${port}`;
	const secrets = loadOrCreateSecrets();

	let databaseUrl = process.env.DATABASE_URL;
	if (!databaseUrl) {
		const cluster = await ensureCluster(DEFAULT_CLUSTER);
		databaseUrl = cluster.url(DEFAULT_CLUSTER.database);
		log(
			`PostgreSQL ${cluster.started ? 'started' : 'already running'} on 127.0.0.1:${DEFAULT_CLUSTER.port} (data in ${DEFAULT_CLUSTER.dir})`,
		);
		if (cluster.started) cleanups.push(() => void stopCluster(DEFAULT_CLUSTER));
	} else {
		log('using DATABASE_URL; the embedded cluster is not started');
	}

	let s3Endpoint = process.env.S3_ENDPOINT;
	if (s3Endpoint === undefined) {
		const s3 = await startS3Fake({
			port: Number(process.env.SAGWISE_S3_PORT ?? 4569),
			dir: '.data/s3',
			bucket: process.env.S3_BUCKET ?? 'sagwise-files',
		});
		cleanups.push(() => s3.close());
		s3Endpoint = s3.endpoint;
		log(`S3 fake on ${s3.endpoint}: files in .data/s3`);
	}

	const db = createDb(databaseUrl, 2);
	try {
		await migrateToLatest(db, (line) => log(line));
		const s3Config = readConfig({ ...process.env, S3_ENDPOINT: s3Endpoint }).s3;
		await ensureBucket(s3Config);
		const storage = createS3Storage(s3Config);
		if (await seedIfEmpty(db, storage)) log('demo data written');
	} finally {
		await db.destroy();
	}

	let smtpUrl = process.env.SMTP_URL;
	let devOutbox: string | undefined;
	if (!smtpUrl) {
		const smtpPort = Number(process.env.SAGWISE_SMTP_PORT ?? 2525);
		const fake = await startSmtpFake({ port: smtpPort, dir: '.data/outbox' });
		cleanups.push(() => fake.close());
		smtpUrl = `smtp://127.0.0.1:${fake.port}`;
		devOutbox = fake.dir;
		log(
			`SMTP fake on 127.0.0.1:${fake.port}: mail lands in ${fake.dir}, shown at ${publicUrl}/dev/outbox`,
		);
	}

	if (buildIsStale()) {
		log('building the app (first run or sources changed)…');
		// Always the production build: a build made under another NODE_ENV (a test run's) compiles JSX
		// for React's development runtime, which the production server does not load.
		const build = spawnSync('npx', ['astro', 'build'], {
			stdio: 'inherit',
			env: { ...process.env, NODE_ENV: 'production' },
		});
		if (build.status !== 0) throw new Error('astro build failed');
	}

	const env = {
		...process.env,
		HOST: host,
		PORT: String(port),
		DATABASE_URL: databaseUrl,
		AUTH_SECRET: process.env.AUTH_SECRET ?? secrets.AUTH_SECRET,
		SAGWISE_METRICS_TOKEN: process.env.SAGWISE_METRICS_TOKEN ?? secrets.METRICS_TOKEN,
		AUTH_TRUST_HOST: process.env.AUTH_TRUST_HOST ?? 'true',
		PUBLIC_URL: publicUrl,
		SMTP_URL: smtpUrl,
		S3_ENDPOINT: s3Endpoint,
		...(devOutbox ? { SAGWISE_DEV_OUTBOX: devOutbox } : {}),
	};
	// The HTTP front (body limits, proxy trust) around the built app. Its stdin is a pipe from this
	// process: if this process dies, even by SIGKILL, the pipe closes and the server stops too.
	const server = spawn(process.execPath, ['dist/serve.mjs'], {
		env: { ...env, SAGWISE_EXIT_WITH_PARENT: '1' },
		stdio: ['pipe', 'inherit', 'inherit'],
	});
	cleanups.unshift(
		() =>
			new Promise<void>((resolve) => {
				// Killed by a signal, a child has no exit code but a signal code; either way it is gone.
				if (server.exitCode !== null || server.signalCode !== null) return resolve();
				server.once('exit', () => resolve());
				server.kill('SIGTERM');
			}),
	);
	server.once('exit', (code) => {
		if (!stopping) {
			log(`server exited with code ${code}`);
			void shutdown(code ?? 1);
		}
	});
	await waitForHealth(`${publicUrl}/api/health`);
	log(`ready in ${((performance.now() - t0) / 1000).toFixed(1)} s → ${publicUrl}`);
	// Last, after the build's output, in a block a newcomer cannot miss.
	const rule = '─'.repeat(64);
	const lines = [
		rule,
		`  Sagwise is running:  ${publicUrl}`,
		`  Demo sign-ins (password ${DEMO_PASSWORD}):`,
		...DEMO_USERS.map((u) => `    ${u.role.padEnd(8)} ${u.email}`),
		...(devOutbox ? [`  Mail the app sends:  ${publicUrl}/dev/outbox`] : []),
		`  Metrics:             ${publicUrl}/api/metrics (bearer token: METRICS_TOKEN in .data/secrets.json)`,
		'  Ctrl-C stops the server and the services it started.',
		rule,
	];
	console.log(`\n${lines.join('\n')}\n`);
}

async function waitForHealth(url: string, timeoutMs = 30_000) {
	const deadline = Date.now() + timeoutMs;
	while (Date.now() < deadline) {
		try {
			const res = await fetch(url);
			if (res.ok) return;
		} catch {
			// not listening yet
		}
		await new Promise((r) => setTimeout(r, 150));
	}
	throw new Error(`the server did not report healthy at ${url} within ${timeoutMs / 1000} s`);
}

let stopping = false;
async function shutdown(code = 0) {
	if (stopping) return;
	stopping = true;
	log('stopping…');
	for (const cleanup of cleanups) {
		try {
			// A service that will not close in time must not keep its siblings' ports taken.
			await Promise.race([cleanup(), new Promise((resolve) => setTimeout(resolve, 5000).unref())]);
		} catch (error) {
			console.error(error);
		}
	}
	process.exit(code);
}

process.on('SIGINT', () => void shutdown(0));
process.on('SIGTERM', () => void shutdown(0));
process.on('SIGHUP', () => void shutdown(0));

main().catch(async (error) => {
	console.error(error instanceof ClusterError ? `[sagwise] ${error.message}` : error);
	await shutdown(1);
});
