import { addDays, format } from 'date-fns';
import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import {
	captainEmails,
	claimNotification,
	findDueReminders,
	listTeamIds,
	lockTeamForDigest,
	revisionsSavedBetween,
	setDigestTime,
} from '@/lib/server/db/notifications';
import type { ServerConfig } from './config';
import type { Mailer } from './mail';

type Db = Kysely<Database>;

const esc = (s: string) =>
	s.replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!);

/**
 * Mails every member of a team about each event that starts within the team's reminder window.
 * Each (event, member) is written to the notification ledger before its mail goes out, inside one
 * transaction per mail: a second run, or a second app instance running at the same time, finds
 * the row and sends nothing; a failed send rolls the row back so the next run tries again.
 */
export async function sendEventReminders(
	db: Db,
	mailer: Mailer,
	config: ServerConfig,
	now = new Date(),
): Promise<number> {
	const today = format(now, 'yyyy-MM-dd');
	const due = await findDueReminders(db, today);
	let sent = 0;
	for (const d of due) {
		const wrote = await db.transaction().execute(async (trx) => {
			if (!(await claimNotification(trx, 'event_reminder', d.event_id, d.user_id))) return false;
			const url = `${config.publicUrl}/teams/${d.team_id}/events`;
			const when = format(new Date(`${d.starts_on}T12:00:00`), 'EEEE d MMMM');
			await mailer.send({
				to: d.email,
				subject: `${d.name} is on ${when}`,
				text: `${d.team_name}: ${d.name} starts on ${when}${d.place ? ` at ${d.place}` : ''}.\n\nBefore you go: pre-event checks, fuses near every battery, batteries secured.\n\nThe team calendar: ${url}\n\n— Sagwise`,
				html: `<p><strong>${esc(d.team_name)}</strong>: ${esc(d.name)} starts on ${esc(when)}${d.place ? ` at ${esc(d.place)}` : ''}.</p><p>Before you go: pre-event checks, fuses near every battery, batteries secured.</p><p><a href="${esc(url)}">The team calendar</a></p>`,
			});
			return true;
		});
		if (wrote) sent++;
	}
	return sent;
}

/**
 * Mails each team's captains the revisions saved since the last digest. The team row is locked
 * (SKIP LOCKED, so parallel runs share the work) and its digest time moves forward in the same
 * transaction as the mail.
 */
export async function sendRevisionDigests(
	db: Db,
	mailer: Mailer,
	config: ServerConfig,
	now = new Date(),
): Promise<number> {
	let sent = 0;
	for (const id of await listTeamIds(db)) {
		sent += await db.transaction().execute(async (trx) => {
			const team = await lockTeamForDigest(trx, id);
			if (!team) return 0;
			const since = team.last_digest_at ?? addDays(now, -7);
			const revisions = await revisionsSavedBetween(trx, team.id, since, now);
			await setDigestTime(trx, team.id, now);
			if (revisions.length === 0) return 0;
			const captains = await captainEmails(trx, team.id);
			const lines = revisions.map(
				(r) =>
					`${r.vehicle} r${r.number}: ${r.message} (${r.author ?? (r.imported_by ? `imported: ${r.imported_by}` : 'someone')})`,
			);
			const url = `${config.publicUrl}/teams/${team.id}`;
			for (const to of captains) {
				await mailer.send({
					to,
					subject: `${team.name}: ${revisions.length} new revision${revisions.length === 1 ? '' : 's'}`,
					text: `Saved since the last digest:\n\n${lines.map((l) => `- ${l}`).join('\n')}\n\nThe team: ${url}\n\n— Sagwise`,
					html: `<p>Saved since the last digest:</p><ul>${lines.map((l) => `<li>${esc(l)}</li>`).join('')}</ul><p><a href="${esc(url)}">The team</a></p>`,
				});
			}
			return captains.length;
		});
	}
	return sent;
}
