import { sql } from 'kysely';
import type { TestProject } from 'vitest/node';
import { ensureCluster, stopCluster, type ClusterOptions } from '../../db/cluster';
import { migrateToLatest } from '../../db/migrator';
import { createDb } from '../../src/lib/server/db/client';

/** The tests' own cluster: never the demo database, on its own port and folder. */
export const TEST_CLUSTER: ClusterOptions = {
	dir: '.data/test-pg',
	port: Number(process.env.SAGWISE_TEST_PG_PORT ?? 54339),
};

declare module 'vitest' {
	export interface ProvidedContext {
		pgAdminUrl: string;
		pgTemplate: string;
	}
}

// Several projects run this setup; the template is made once per test run (the env var is shared
// by every project in the main process) so one project never drops it under another.
process.env.SAGWISE_TEST_RUN ??= String(Date.now());
const template = `sagwise_template_${process.env.SAGWISE_TEST_RUN}`;
let startedHere = false;

export default async function setup(project: TestProject) {
	const cluster = await ensureCluster(TEST_CLUSTER);
	startedHere ||= cluster.started;
	const admin = createDb(cluster.url(), 1);
	try {
		const existing = await sql<{
			datname: string;
		}>`select datname from pg_database where datname like 'sagwise_template_%'`.execute(admin);
		if (!existing.rows.some((row) => row.datname === template)) {
			// Leftovers of earlier runs go; a fresh template proves every migration applies from empty.
			for (const row of existing.rows)
				await sql`drop database if exists ${sql.id(row.datname)} with (force)`.execute(admin);
			await sql`create database ${sql.id(template)}`.execute(admin);
			const templateDb = createDb(cluster.url(template), 1);
			try {
				await migrateToLatest(templateDb);
			} finally {
				await templateDb.destroy();
			}
		}
	} finally {
		await admin.destroy();
	}
	project.provide('pgAdminUrl', cluster.url());
	project.provide('pgTemplate', template);
	return () => {
		if (startedHere) {
			startedHere = false;
			stopCluster(TEST_CLUSTER);
		}
	};
}
