import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Kysely } from 'kysely';
import { seedDemo } from '../../db/seed';
import { ensureCluster } from '../../db/cluster';
import { migrateToLatest } from '../../db/migrator';
import { startS3Fake } from '../../src/cli/s3-fake';
import { startSmtpFake } from '../../src/cli/smtp-fake';
import { createDb } from '../../src/lib/server/db/client';
import type { Database } from '../../src/lib/server/db/schema';
import { type AppServer, startAppServer } from '../helpers/app-server';

/**
 * The built app for a bench: its own cluster (`.data/bench-pg`) migrated and seeded with the demo
 * team once, the SMTP and S3 fakes, and the server on `port`. `prepare` runs against the database
 * before the server starts (a bench's own vehicle, say). Needs `npm run build` first.
 */
export async function startBenchApp(
	port: number,
	prepare?: (db: Kysely<Database>) => Promise<void>,
): Promise<{ server: AppServer; stop: () => Promise<void> }> {
	const cluster = await ensureCluster({
		dir: '.data/bench-pg',
		port: Number(process.env.SAGWISE_BENCH_PG_PORT ?? 54359),
		database: 'sagwise_bench',
	});
	const dbUrl = cluster.url('sagwise_bench');
	const db = createDb(dbUrl, 1);
	await migrateToLatest(db);
	if (!(await db.selectFrom('team').select('id').executeTakeFirst())) await seedDemo(db);
	await prepare?.(db);
	await db.destroy();
	const smtp = await startSmtpFake({
		port: 0,
		dir: mkdtempSync(path.join(tmpdir(), 'sagwise-bench-mail-')),
	});
	// Kept beside the bench cluster: files uploaded by one bench run are still there for the next.
	const s3 = await startS3Fake({ port: 0, dir: '.data/bench-s3', bucket: 'sagwise-files' });
	const server = await startAppServer(port, {
		DATABASE_URL: dbUrl,
		SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
		S3_ENDPOINT: s3.endpoint,
		S3_BUCKET: 'sagwise-files',
	});
	return {
		server,
		stop: async () => {
			await server.stop();
			await smtp.close();
			await s3.close();
		},
	};
}
