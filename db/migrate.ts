/** CLI: `npm run db:migrate` migrates DATABASE_URL (or the embedded cluster) to the latest version. */
import { createDb } from '../src/lib/server/db/client';
import { DEFAULT_CLUSTER, ensureCluster } from './cluster';
import { migrateToLatest } from './migrator';

const url =
	process.env.DATABASE_URL ?? (await ensureCluster(DEFAULT_CLUSTER)).url(DEFAULT_CLUSTER.database);
const db = createDb(url, 1);
try {
	await migrateToLatest(db, console.log);
	console.log('database is at the latest version');
} catch (error) {
	console.error('migration failed:', error);
	process.exitCode = 1;
} finally {
	await db.destroy();
}
