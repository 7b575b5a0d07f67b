import { type Kysely, sql } from 'kysely';
import type { Database } from '@/lib/server/db/schema';

type Db = Kysely<Database>;

/** Every (event, member) whose reminder is due today and not yet in the ledger. */
export function findDueReminders(db: Db, today: string) {
	return db
		.selectFrom('event as e')
		.innerJoin('team as t', 't.id', 'e.team_id')
		.innerJoin('membership as m', 'm.team_id', 't.id')
		.innerJoin('User as u', 'u.id', 'm.user_id')
		.select([
			'e.id as event_id',
			'e.name',
			'e.starts_on',
			'e.place',
			't.id as team_id',
			't.name as team_name',
			't.reminder_days',
			'u.id as user_id',
			'u.email',
		])
		.where('e.starts_on', '>=', today)
		.where(sql<boolean>`e.starts_on <= (${today}::date + t.reminder_days)`)
		.where(({ not, exists, selectFrom }) =>
			not(
				exists(
					selectFrom('notification_sent as n')
						.select('n.user_id')
						.whereRef('n.user_id', '=', 'u.id')
						.where('n.kind', '=', 'event_reminder')
						.whereRef('n.subject_key', '=', sql`e.id::text`),
				),
			),
		)
		.execute();
}

/** Writes a notification to the ledger; false when it was already there (someone else sent it). */
export async function claimNotification(
	db: Db,
	kind: 'event_reminder' | 'revision_digest' | 'mention_digest',
	subjectKey: string,
	userId: string,
): Promise<boolean> {
	const row = await db
		.insertInto('notification_sent')
		.values({ kind, subject_key: subjectKey, user_id: userId })
		.onConflict((oc) => oc.doNothing())
		.returning('user_id')
		.executeTakeFirst();
	return Boolean(row);
}

export async function listTeamIds(db: Db): Promise<string[]> {
	return (await db.selectFrom('team').select('id').execute()).map((t) => t.id);
}

/** Locks a team's row for its digest (SKIP LOCKED: undefined when another run holds it). */
export function lockTeamForDigest(db: Db, teamId: string) {
	return db
		.selectFrom('team')
		.select(['id', 'name', 'last_digest_at'])
		.where('id', '=', teamId)
		.forUpdate()
		.skipLocked()
		.executeTakeFirst();
}

/** Revisions saved in a team's vehicles in (since, until], oldest first. */
export function revisionsSavedBetween(db: Db, teamId: string, since: Date, until: Date) {
	return db
		.selectFrom('revision as r')
		.innerJoin('build as b', 'b.id', 'r.build_id')
		.innerJoin('vehicle as v', 'v.id', 'b.vehicle_id')
		.leftJoin('User as u', 'u.id', 'r.author_id')
		.select(['v.name as vehicle', 'r.number', 'r.message', 'u.name as author', 'r.imported_by'])
		.where('v.team_id', '=', teamId)
		.where('r.created_at', '>', since)
		.where('r.created_at', '<=', until)
		.orderBy('r.created_at')
		.execute();
}

export async function setDigestTime(db: Db, teamId: string, at: Date): Promise<void> {
	await db.updateTable('team').set({ last_digest_at: at }).where('id', '=', teamId).execute();
}

export async function captainEmails(db: Db, teamId: string): Promise<string[]> {
	const rows = await db
		.selectFrom('membership as m')
		.innerJoin('User as u', 'u.id', 'm.user_id')
		.select('u.email')
		.where('m.team_id', '=', teamId)
		.where('m.role', '=', 'captain')
		.execute();
	return rows.map((r) => r.email);
}
