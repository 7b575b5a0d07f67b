import { Kysely, PostgresDialect, sql } from 'kysely';
import pg from 'pg';
import type { Database } from '@/lib/server/db/schema';

// bigint counts come back as numbers; double precision is already a number, timestamps a Date.
pg.types.setTypeParser(pg.types.builtins.INT8, (value) => Number(value));
// Calendar dates stay yyyy-MM-dd strings: a Date would shift them by the server's time zone.
pg.types.setTypeParser(pg.types.builtins.DATE, (value) => value);

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
	pool.on('error', (error) => console.error('database pool: idle client error:', error.message));
	// A client checked out of the pool has no listener of the pool's: when the server stops in the
	// middle of a query, the client emits 'error' as well as failing the query, and an 'error' event
	// without a listener ends the process. The query's own rejection is what the request answers.
	pool.on('connect', (client) => {
		client.on('error', (error) => console.error('database client error:', error.message));
	});
	return new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
}

/** The server's version, read in one round trip (the health check). */
export async function serverVersion(db: Kysely<Database>): Promise<string> {
	const { rows } = await sql<{
		version: string;
	}>`select current_setting('server_version') as version`.execute(db);
	return rows[0]?.version ?? '';
}
