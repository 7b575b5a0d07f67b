import { addDays, format } from 'date-fns';
import { type Kysely, sql } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import type { ServerConfig } from './config';
import type { Mailer } from './mail';

type Db = Kysely<Database>;

const esc = (s: string) => s.replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!);

/**
 * Mails every member of a team about each event that starts within the team's reminder window.
 * Each (event, member) is written to the notification ledger before its mail goes out, inside one
 * transaction per mail: a second run, or a second app instance running at the same time, finds
 * the row and sends nothing; a failed send rolls the row back so the next run tries again.
 */
export async function sendEventReminders(db: Db, mailer: Mailer, config: ServerConfig, now = new Date()): Promise<number> {
	const today = format(now, 'yyyy-MM-dd');
	const due = await db
		.selectFrom('event as e')
		.innerJoin('team as t', 't.id', 'e.team_id')
		.innerJoin('membership as m', 'm.team_id', 't.id')
		.innerJoin('User as u', 'u.id', 'm.user_id')
		.select(['e.id as event_id', 'e.name', 'e.starts_on', 'e.place', 't.id as team_id', 't.name as team_name', 't.reminder_days', 'u.id as user_id', 'u.email'])
		.where('e.starts_on', '>=', today)
		.where(sql<boolean>`e.starts_on <= (${today}::date + t.reminder_days)`)
		.where(({ not, exists, selectFrom }) =>
			not(exists(selectFrom('notification_sent as n').select('n.user_id').whereRef('n.user_id', '=', 'u.id').where('n.kind', '=', 'event_reminder').whereRef('n.subject_key', '=', sql`e.id::text`))),
		)
		.execute();
	let sent = 0;
	for (const d of due) {
		const wrote = await db.transaction().execute(async (trx) => {
			const row = await trx
				.insertInto('notification_sent')
				.values({ kind: 'event_reminder', subject_key: d.event_id, user_id: d.user_id })
				.onConflict((oc) => oc.doNothing())
				.returning('user_id')
				.executeTakeFirst();
			if (!row) return false;
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
export async function sendRevisionDigests(db: Db, mailer: Mailer, config: ServerConfig, now = new Date()): Promise<number> {
	const teams = await db.selectFrom('team').select('id').execute();
	let sent = 0;
	for (const { id } of teams) {
		sent += await db.transaction().execute(async (trx) => {
			const team = await trx.selectFrom('team').select(['id', 'name', 'last_digest_at']).where('id', '=', id).forUpdate().skipLocked().executeTakeFirst();
			if (!team) return 0;
			const since = team.last_digest_at ?? addDays(now, -7);
			const revisions = await trx
				.selectFrom('revision as r')
				.innerJoin('build as b', 'b.id', 'r.build_id')
				.innerJoin('vehicle as v', 'v.id', 'b.vehicle_id')
				.leftJoin('User as u', 'u.id', 'r.author_id')
				.select(['v.name as vehicle', 'r.number', 'r.message', 'u.name as author', 'r.imported_by'])
				.where('v.team_id', '=', team.id)
				.where('r.created_at', '>', since)
				.where('r.created_at', '<=', now)
				.orderBy('r.created_at')
				.execute();
			await trx.updateTable('team').set({ last_digest_at: now }).where('id', '=', team.id).execute();
			if (revisions.length === 0) return 0;
			const captains = await trx.selectFrom('membership as m').innerJoin('User as u', 'u.id', 'm.user_id').select('u.email').where('m.team_id', '=', team.id).where('m.role', '=', 'captain').execute();
			const lines = revisions.map((r) => `${r.vehicle} r${r.number}: ${r.message} (${r.author ?? (r.imported_by ? `imported: ${r.imported_by}` : 'someone')})`);
			const url = `${config.publicUrl}/teams/${team.id}`;
			for (const c of captains) {
				await mailer.send({
					to: c.email,
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
