import { format } from 'date-fns';
import { db } from '@/lib/server/db/index';
import { databasePoolStats } from '@/lib/server/db/client';
import { findDueReminders } from '@/lib/server/db/notifications';
import { gaugeOnScrape } from '@/lib/server/metrics';

/**
 * The gauges read at scrape time from what holds them: the database pool, and the mail waiting to
 * go out (event reminders due and not yet sent; the jobs command sends them).
 */
gaugeOnScrape(
	'sagwise_db_pool_connections',
	'Database connections the server holds',
	() => databasePoolStats().total,
);
gaugeOnScrape(
	'sagwise_db_pool_idle',
	'Database connections idle in the pool',
	() => databasePoolStats().idle,
);
gaugeOnScrape(
	'sagwise_db_pool_waiting',
	'Queries waiting for a database connection',
	() => databasePoolStats().waiting,
);
gaugeOnScrape('sagwise_reminders_due', 'Event reminders due and not yet sent', async () => {
	const due = await Promise.race([
		findDueReminders(db, format(new Date(), 'yyyy-MM-dd')),
		new Promise<never>((_, reject) => setTimeout(() => reject(new Error('timeout')), 2000)),
	]);
	return due.length;
});
