/**
 * A PostgreSQL cluster on loopback for the start command and the tests.
 *
 * The cluster lives in a gitignored folder, listens on 127.0.0.1 at a fixed port with its socket
 * inside that folder, and is reused when it is already running. initdb refuses to run as root, so
 * as root every server command runs as the `postgres` user through runuser.
 *
 * CLI: `tsx db/cluster.ts start|stop|status [--dir .data/pg] [--port 54329]`
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { chownSync, existsSync, mkdirSync, readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import pg from 'pg';

export interface ClusterOptions {
	/** Folder that holds data/, run/ (socket) and log. */
	dir: string;
	port: number;
	/** Database created when missing. */
	database?: string;
}

export interface Cluster {
	url: (database?: string) => string;
	/** True when this call started the server (false when it was already running). */
	started: boolean;
}

export class ClusterError extends Error {}

const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

/** Finds initdb/pg_ctl: PG_BIN, then Debian's /usr/lib/postgresql/<major>/bin, newest first. */
export function findServerBin(): string {
	const fromEnv = process.env.PG_BIN;
	if (fromEnv && existsSync(path.join(fromEnv, 'initdb'))) return fromEnv;
	const root = '/usr/lib/postgresql';
	if (existsSync(root)) {
		const majors = readdirSync(root)
			.filter((name) => existsSync(path.join(root, name, 'bin', 'initdb')))
			.sort((a, b) => Number(b) - Number(a));
		if (majors[0]) return path.join(root, majors[0], 'bin');
	}
	throw new ClusterError(
		'PostgreSQL server binaries not found: install them with `apt-get install postgresql` (or set PG_BIN).',
	);
}

function run(bin: string, args: string[], opts: { allowFail?: boolean } = {}) {
	const [cmd, argv] = isRoot ? ['runuser', ['-u', 'postgres', '--', bin, ...args]] : [bin, args];
	const result = spawnSync(cmd, argv, { encoding: 'utf8' });
	if (result.status !== 0 && !opts.allowFail) {
		throw new ClusterError(`${path.basename(bin)} failed: ${result.stderr || result.stdout}`);
	}
	return result;
}

function paths(dir: string) {
	const abs = path.resolve(dir);
	return {
		abs,
		data: path.join(abs, 'data'),
		run: path.join(abs, 'run'),
		log: path.join(abs, 'server.log'),
	};
}

function prepareDir(dir: string) {
	mkdirSync(dir, { recursive: true });
	if (isRoot) {
		// postgres must own the folder (and be able to reach it) to initdb into it.
		execFileSync('chown', ['-R', 'postgres:postgres', dir]);
		let parent = path.dirname(dir);
		while (parent !== '/') {
			spawnSync('chmod', ['o+x', parent]);
			parent = path.dirname(parent);
		}
	} else {
		chownSync(dir, process.getuid?.() ?? 0, process.getgid?.() ?? 0);
	}
}

export function isRunning(opts: ClusterOptions): boolean {
	const bin = findServerBin();
	const p = paths(opts.dir);
	if (!existsSync(path.join(p.data, 'PG_VERSION'))) return false;
	return run(path.join(bin, 'pg_ctl'), ['-D', p.data, 'status'], { allowFail: true }).status === 0;
}

async function waitForConnections(url: string, timeoutMs = 20_000): Promise<void> {
	const deadline = Date.now() + timeoutMs;
	let lastError: unknown;
	while (Date.now() < deadline) {
		const client = new pg.Client({ connectionString: url, connectionTimeoutMillis: 1000 });
		try {
			await client.connect();
			await client.query('select 1');
			await client.end();
			return;
		} catch (error) {
			lastError = error;
			await client.end().catch(() => {});
			await new Promise((r) => setTimeout(r, 200));
		}
	}
	throw new ClusterError(
		`PostgreSQL did not accept connections within ${timeoutMs} ms: ${String(lastError)}`,
	);
}

/** Creates `database` when it does not exist yet. */
export async function ensureDatabase(adminUrl: string, database: string): Promise<void> {
	const client = new pg.Client({ connectionString: adminUrl });
	await client.connect();
	try {
		const found = await client.query('select 1 from pg_database where datname = $1', [database]);
		if (found.rowCount === 0)
			await client.query(`create database "${database.replaceAll('"', '""')}"`);
	} finally {
		await client.end();
	}
}

/** Initialises (first time), starts (unless running) and waits for the cluster. Idempotent. */
export async function ensureCluster(opts: ClusterOptions): Promise<Cluster> {
	const bin = findServerBin();
	const p = paths(opts.dir);
	const url = (database = 'postgres') => `postgres://postgres@127.0.0.1:${opts.port}/${database}`;
	let started = false;
	if (!existsSync(path.join(p.data, 'PG_VERSION'))) {
		prepareDir(p.abs);
		run(path.join(bin, 'initdb'), [
			'-D',
			p.data,
			'-U',
			'postgres',
			'--auth=trust',
			'-E',
			'UTF8',
			'--locale=C.UTF-8',
		]);
	}
	if (!isRunning(opts)) {
		prepareDir(p.abs);
		mkdirSync(p.run, { recursive: true });
		if (isRoot) execFileSync('chown', ['postgres:postgres', p.run]);
		try {
			run(path.join(bin, 'pg_ctl'), [
				'-D',
				p.data,
				'-l',
				p.log,
				'-w',
				'-t',
				'30',
				'-o',
				`-p ${opts.port} -k ${p.run} -c listen_addresses=127.0.0.1 -c fsync=off`,
				'start',
			]);
		} catch (error) {
			const log = existsSync(p.log) ? readFileSync(p.log, 'utf8') : '';
			if (/Address already in use/.test(log.slice(-2000))) {
				throw new ClusterError(
					`Port ${opts.port} on 127.0.0.1 is taken by another server: stop it, or choose another port (SAGWISE_PG_PORT for npm start, SAGWISE_TEST_PG_PORT for the tests).`,
				);
			}
			throw error;
		}
		started = true;
	}
	await waitForConnections(url());
	if (opts.database) await ensureDatabase(url(), opts.database);
	return { url, started };
}

/** Stops the server: `fast` rolls back open work and closes cleanly; `immediate` is a crash (tests of faults). */
export function stopCluster(opts: ClusterOptions, mode: 'fast' | 'immediate' = 'fast'): boolean {
	if (!isRunning(opts)) return false;
	const bin = findServerBin();
	run(path.join(bin, 'pg_ctl'), ['-D', paths(opts.dir).data, '-m', mode, '-w', 'stop']);
	return true;
}

export const DEFAULT_CLUSTER: ClusterOptions = {
	dir: process.env.SAGWISE_PG_DIR ?? '.data/pg',
	port: Number(process.env.SAGWISE_PG_PORT ?? 54329),
	database: 'sagwise',
};

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
	const [command = 'start'] = process.argv.slice(2);
	try {
		if (command === 'start') {
			const cluster = await ensureCluster(DEFAULT_CLUSTER);
			console.log(
				`${cluster.started ? 'started' : 'already running'}: ${cluster.url(DEFAULT_CLUSTER.database)}`,
			);
		} else if (command === 'stop') {
			console.log(stopCluster(DEFAULT_CLUSTER) ? 'stopped' : 'not running');
		} else if (command === 'status') {
			console.log(isRunning(DEFAULT_CLUSTER) ? 'running' : 'stopped');
		} else {
			console.error('usage: tsx db/cluster.ts start|stop|status');
			process.exitCode = 2;
		}
	} catch (error) {
		console.error(error instanceof ClusterError ? error.message : error);
		process.exitCode = 1;
	}
}
