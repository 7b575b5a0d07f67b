/**
 * `npm run jobs`: event reminders, the captains' revision digest, mention mail (any the app could
 * not send at once, and each day's digest for those who chose it) and the sweep of stored files no
 * row points at, for a scheduler (cron, a systemd timer) to call — hourly is plenty. Safe to run
 * twice and on several machines at once. `npm run jobs -- reminders|digest|mentions|sweep` runs one.
 */
import { createDb } from '../lib/server/db/client';
import { sendEventReminders, sendRevisionDigests } from '../lib/server/reminders';
import { sendMentionDigests, sendMentionMail } from '../lib/server/mention-mail';
import { readConfig } from '../lib/server/config';
import { createSmtpMailer } from '../lib/server/mail';
import { sweepOrphanObjects } from '../lib/server/object-cleanup';
import { createS3Storage } from '../lib/server/storage';
import { DEFAULT_CLUSTER, ensureCluster } from '../../db/cluster';

const config = readConfig();
const url =
	process.env.DATABASE_URL ?? (await ensureCluster(DEFAULT_CLUSTER)).url(DEFAULT_CLUSTER.database);
const db = createDb(url, 2);
const mailer = createSmtpMailer(config.smtpUrl, config.mailFrom);
try {
	const which = process.argv[2] ?? 'all';
	if (which === 'all' || which === 'reminders')
		console.log(`event reminders sent: ${await sendEventReminders(db, mailer, config)}`);
	if (which === 'all' || which === 'digest')
		console.log(`revision digests sent: ${await sendRevisionDigests(db, mailer, config)}`);
	if (which === 'all' || which === 'mentions') {
		console.log(`mention mails sent: ${await sendMentionMail(db, mailer, config)}`);
		console.log(`mention digests sent: ${await sendMentionDigests(db, mailer, config)}`);
	}
	if (which === 'all' || which === 'sweep')
		console.log(
			`stored files without a row removed: ${await sweepOrphanObjects(db, createS3Storage(config.s3))}`,
		);
} catch (error) {
	console.error(error);
	process.exitCode = 1;
} finally {
	await db.destroy();
}
