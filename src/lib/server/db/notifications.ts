import { type Kysely, sql } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import { placeOf, withSubjects } from '@/lib/server/db/comments';

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

// ---- mentions: read in the app, mailed at once or in a digest

/**
 * A person's notifications, newest first, from teams they are still in: a removed member's stop
 * at once (and are deleted with the membership).
 */
export async function findNotifications(db: Db, userId: string, limit = 50) {
	const rows = await withSubjects(db)
		.innerJoin('notification as n', 'n.comment_id', 'c.id')
		.innerJoin('membership as m', (j) =>
			j.onRef('m.team_id', '=', 'n.team_id').onRef('m.user_id', '=', 'n.user_id'),
		)
		.innerJoin('team as t', 't.id', 'n.team_id')
		.leftJoin('User as a', 'a.id', 'c.author_id')
		.select([
			'n.id',
			'n.created_at',
			'n.read_at',
			't.name as team_name',
			'c.body',
			'c.author_name',
			'c.imported_by',
			'a.name',
			'a.email',
		])
		.where('n.user_id', '=', userId)
		.orderBy('n.created_at', 'desc')
		.limit(limit)
		.execute();
	return rows.map((r) => ({ ...r, place: placeOf(r) }));
}

export async function unreadCount(db: Db, userId: string): Promise<number> {
	const row = await db
		.selectFrom('notification as n')
		.innerJoin('membership as m', (j) =>
			j.onRef('m.team_id', '=', 'n.team_id').onRef('m.user_id', '=', 'n.user_id'),
		)
		.select((eb) => eb.fn.countAll<string>().as('n'))
		.where('n.user_id', '=', userId)
		.where('n.read_at', 'is', null)
		.executeTakeFirstOrThrow();
	return Number(row.n);
}

export async function markRead(
	db: Db,
	userId: string,
	which: { all: true } | { ids: string[] },
): Promise<number> {
	let q = db
		.updateTable('notification')
		.set({ read_at: new Date() })
		.where('user_id', '=', userId)
		.where('read_at', 'is', null);
	if ('ids' in which) q = q.where('id', 'in', which.ids);
	const r = await q.executeTakeFirst();
	return Number(r.numUpdatedRows);
}

/**
 * Notifications whose mail has not gone out, of people still in the team who want mail in this
 * way, with what the mail says. `ids` narrows it to these notifications.
 */
export async function findUnmailed(
	db: Db,
	choice: 'immediate' | 'daily',
	opts: { ids?: string[]; userId?: string } = {},
) {
	let q = withSubjects(db)
		.innerJoin('notification as n', 'n.comment_id', 'c.id')
		.innerJoin('membership as m', (j) =>
			j.onRef('m.team_id', '=', 'n.team_id').onRef('m.user_id', '=', 'n.user_id'),
		)
		.innerJoin('User as to', 'to.id', 'n.user_id')
		.innerJoin('team as t', 't.id', 'n.team_id')
		.leftJoin('User as a', 'a.id', 'c.author_id')
		.select([
			'n.id',
			'n.user_id',
			'n.created_at',
			'to.email as to_email',
			't.name as team_name',
			'c.body',
			'c.author_name',
			'c.imported_by',
			'a.name',
			'a.email',
		])
		.where('n.mailed_at', 'is', null)
		.where('to.mention_mail', '=', choice);
	if (opts.ids) q = q.where('n.id', 'in', opts.ids.length ? opts.ids : ['']);
	if (opts.userId) q = q.where('n.user_id', '=', opts.userId);
	const rows = await q.orderBy('n.created_at').limit(1000).execute();
	return rows.map((r) => ({ ...r, place: placeOf(r) }));
}

/** Marks these notifications mailed; the ids it took (another sender may have taken the rest). */
export async function claimMailed(db: Db, ids: string[]): Promise<string[]> {
	if (ids.length === 0) return [];
	const rows = await db
		.updateTable('notification')
		.set({ mailed_at: new Date() })
		.where('id', 'in', ids)
		.where('mailed_at', 'is', null)
		.returning('id')
		.execute();
	return rows.map((r) => r.id);
}

/** Gives mentions back to the senders after their mail failed, so a later run tries again. */
export async function releaseMailed(db: Db, ids: string[]): Promise<void> {
	if (ids.length === 0) return;
	await db.updateTable('notification').set({ mailed_at: null }).where('id', 'in', ids).execute();
}

/** Takes a ledger entry back after its mail failed. */
export async function releaseNotification(
	db: Db,
	kind: 'event_reminder' | 'revision_digest' | 'mention_digest',
	subjectKey: string,
	userId: string,
): Promise<void> {
	await db
		.deleteFrom('notification_sent')
		.where('kind', '=', kind)
		.where('subject_key', '=', subjectKey)
		.where('user_id', '=', userId)
		.execute();
}

/** Everyone with unmailed notifications who wants a daily digest. */
export async function digestRecipients(db: Db): Promise<string[]> {
	const rows = await db
		.selectFrom('notification as n')
		.innerJoin('User as u', 'u.id', 'n.user_id')
		.select('n.user_id')
		.distinct()
		.where('n.mailed_at', 'is', null)
		.where('u.mention_mail', '=', 'daily')
		.execute();
	return rows.map((r) => r.user_id);
}

export async function setMentionMail(
	db: Db,
	userId: string,
	choice: 'immediate' | 'daily' | 'off',
): Promise<boolean> {
	const r = await db
		.updateTable('User')
		.set({ mention_mail: choice })
		.where('id', '=', userId)
		.executeTakeFirst();
	return Number(r.numUpdatedRows) > 0;
}

export async function mentionMailOf(db: Db, userId: string) {
	const row = await db
		.selectFrom('User')
		.select('mention_mail')
		.where('id', '=', userId)
		.executeTakeFirst();
	return row?.mention_mail ?? 'immediate';
}
