import { type Kysely, sql } from 'kysely';
import type { Database } from '../../../db/schema';

export interface HealthReport {
	status: 'ok';
	version: string;
	database: { status: 'ok'; latencyMs: number; serverVersion: string };
}

/** One real round trip: asks the server for its version and times it. Throws when unreachable. */
export async function checkDatabase(db: Kysely<Database>): Promise<HealthReport['database']> {
	const started = performance.now();
	const { rows } = await sql<{ version: string }>`select current_setting('server_version') as version`.execute(db);
	return { status: 'ok', latencyMs: Math.round((performance.now() - started) * 10) / 10, serverVersion: rows[0]?.version ?? '' };
}
