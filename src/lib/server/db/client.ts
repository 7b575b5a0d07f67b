import { Kysely, PostgresDialect, sql } from 'kysely';
import pg from 'pg';
import type { Database } from '@/lib/server/db/schema';
import { errorField, log } from '@/lib/server/log';

// bigint counts come back as numbers; double precision is already a number, timestamps a Date.
pg.types.setTypeParser(pg.types.builtins.INT8, (value) => Number(value));
// Calendar dates stay yyyy-MM-dd strings: a Date would shift them by the server's time zone.
pg.types.setTypeParser(pg.types.builtins.DATE, (value) => value);

const pools = new Set<pg.Pool>();

/** How the server's database pools stand: connections open, idle, and requests waiting for one. */
export function databasePoolStats() {
	let total = 0;
	let idle = 0;
	let waiting = 0;
	for (const p of pools) {
		total += p.totalCount;
		idle += p.idleCount;
		waiting += p.waitingCount;
	}
	return { total, idle, waiting };
}

export function createDb(connectionString: string, max = 10): Kysely<Database> {
	const pool = new pg.Pool({
		connectionString,
		max,
		connectionTimeoutMillis: 3000,
		// A query the server never answers (a frozen host, a half-open socket) must not hold a request forever.
		query_timeout: 30_000,
		keepAlive: true,
	});
	// An idle client whose server went away emits 'error'; without a listener that kills the process.
	// The next query gets a fresh connection (or fails and answers 503 where it is asked).
	pool.on('error', (error) =>
		log.warn({ err: errorField(error) }, 'database pool: idle client error'),
	);
	// A client checked out of the pool has no listener of the pool's: when the server stops in the
	// middle of a query, the client emits 'error' as well as failing the query, and an 'error' event
	// without a listener ends the process. The query's own rejection is what the request answers.
	pool.on('connect', (client) => {
		client.on('error', (error) => log.warn({ err: errorField(error) }, 'database client error'));
	});
	pools.add(pool);
	const end = pool.end.bind(pool);
	pool.end = (() => {
		pools.delete(pool);
		return end();
	}) as typeof pool.end;
	return new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
}

/** The server's version, read in one round trip (the health check). */
export async function serverVersion(db: Kysely<Database>): Promise<string> {
	const { rows } = await sql<{
		version: string;
	}>`select current_setting('server_version') as version`.execute(db);
	return rows[0]?.version ?? '';
}
