import { type Kysely, sql } from 'kysely';
import { inject } from 'vitest';
import type { Database } from '../../src/lib/server/db/schema';
import { createDb } from '../../src/lib/server/db/client';

export interface TestDb {
	db: Kysely<Database>;
	url: string;
	/** Destroys the pool and drops the database. */
	drop: () => Promise<void>;
}

function withDatabase(url: string, database: string): string {
	const u = new URL(url);
	u.pathname = `/${database}`;
	return u.toString();
}

/** A database of its own for one test file, copied from the migrated template. */
export async function createTestDb(): Promise<TestDb> {
	const adminUrl = inject('pgAdminUrl');
	const name = `t_${process.env.VITEST_POOL_ID ?? '0'}_${Date.now()}_${Math.floor(Math.random() * 1e6)}`;
	const admin = createDb(adminUrl, 1);
	try {
		await sql`create database ${sql.id(name)} template ${sql.id(inject('pgTemplate'))}`.execute(
			admin,
		);
	} finally {
		await admin.destroy();
	}
	const url = withDatabase(adminUrl, name);
	const db = createDb(url, 4);
	return {
		db,
		url,
		drop: async () => {
			await db.destroy();
			const dropper = createDb(adminUrl, 1);
			try {
				await sql`drop database if exists ${sql.id(name)} with (force)`.execute(dropper);
			} finally {
				await dropper.destroy();
			}
		},
	};
}
