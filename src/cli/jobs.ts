/**
 * `npm run jobs`: event reminders and the captains' revision digest, for a scheduler (cron, a
 * systemd timer) to call — hourly is plenty. Safe to run twice and on several machines at once.
 */
import { createDb } from '../lib/server/db/client';
import { sendEventReminders, sendRevisionDigests } from '../lib/server/jobs';
import { readConfig } from '../lib/server/config';
import { createSmtpMailer } from '../lib/server/mail';
import { DEFAULT_CLUSTER, ensureCluster } from '../../db/cluster';

const config = readConfig();
const url = process.env.DATABASE_URL ?? (await ensureCluster(DEFAULT_CLUSTER)).url(DEFAULT_CLUSTER.database);
const db = createDb(url, 2);
const mailer = createSmtpMailer(config.smtpUrl, config.mailFrom);
try {
	const which = process.argv[2] ?? 'all';
	if (which === 'all' || which === 'reminders') console.log(`event reminders sent: ${await sendEventReminders(db, mailer, config)}`);
	if (which === 'all' || which === 'digest') console.log(`revision digests sent: ${await sendRevisionDigests(db, mailer, config)}`);
} catch (error) {
	console.error(error);
	process.exitCode = 1;
} finally {
	await db.destroy();
}
