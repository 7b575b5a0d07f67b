import { Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import type { Database } from '../../../../db/schema';

// bigint counts come back as numbers; double precision is already a number, timestamps a Date.
pg.types.setTypeParser(pg.types.builtins.INT8, (value) => Number(value));
// Calendar dates stay yyyy-MM-dd strings: a Date would shift them by the server's time zone.
pg.types.setTypeParser(pg.types.builtins.DATE, (value) => value);

export function createDb(connectionString: string, max = 10): Kysely<Database> {
	const pool = new pg.Pool({ connectionString, max, connectionTimeoutMillis: 3000 });
	// An idle client whose server went away emits 'error'; without a listener that kills the process.
	// The next query gets a fresh connection (or fails and answers 503 where it is asked).
	pool.on('error', (error) => console.error('database pool: idle client error:', error.message));
	return new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
}
