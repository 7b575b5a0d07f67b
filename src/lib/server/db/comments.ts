import { format } from 'date-fns';
import type { Kysely } from 'kysely';
import type { CommentSubjectKind, ThreadSubject } from '@/lib/schemas/comments';
import type { Database } from '@/lib/server/db/schema';
import type { Mentionable } from '@/lib/mentions';

type Db = Kysely<Database>;

/** What a thread is beside, in words, and where it is. */
export interface SubjectPlace {
	label: string;
	href: string;
	vehicleId: string | null;
	vehicleName: string | null;
}

const SUBJECT_COLUMN = {
	revision: 'revision_id',
	run: 'run_id',
	plan: 'plan_id',
	event: 'event_id',
} as const satisfies Record<CommentSubjectKind, string>;

/** The comment's subject columns joined to what names them (any of the four may be empty). */
export function withSubjects(db: Db) {
	return db
		.selectFrom('comment as c')
		.leftJoin('revision as rev', 'rev.id', 'c.revision_id')
		.leftJoin('build as rb', 'rb.id', 'rev.build_id')
		.leftJoin('vehicle as rv', 'rv.id', 'rb.vehicle_id')
		.leftJoin('run as run', 'run.id', 'c.run_id')
		.leftJoin('vehicle as uv', 'uv.id', 'run.vehicle_id')
		.leftJoin('plan as p', 'p.id', 'c.plan_id')
		.leftJoin('vehicle as pv', 'pv.id', 'p.vehicle_id')
		.leftJoin('event as e', 'e.id', 'c.event_id')
		.select([
			'c.team_id',
			'c.revision_id',
			'c.run_id',
			'c.plan_id',
			'c.event_id',
			'rev.number as rev_number',
			'rv.id as rev_vehicle_id',
			'rv.name as rev_vehicle_name',
			'run.ran_at as run_at',
			'uv.id as run_vehicle_id',
			'uv.name as run_vehicle_name',
			'p.name as plan_name',
			'pv.id as plan_vehicle_id',
			'pv.name as plan_vehicle_name',
			'e.name as event_name',
		]);
}

type SubjectRow = {
	team_id: string;
	revision_id: string | null;
	run_id: string | null;
	plan_id: string | null;
	event_id: string | null;
	rev_number: number | null;
	rev_vehicle_id: string | null;
	rev_vehicle_name: string | null;
	run_at: Date | null;
	run_vehicle_id: string | null;
	run_vehicle_name: string | null;
	plan_name: string | null;
	plan_vehicle_id: string | null;
	plan_vehicle_name: string | null;
	event_name: string | null;
};

export function placeOf(r: SubjectRow): SubjectPlace {
	const team = `/teams/${r.team_id}`;
	if (r.revision_id)
		return {
			label: `r${r.rev_number} of ${r.rev_vehicle_name}`,
			href: `${team}/vehicles/${r.rev_vehicle_id}/history?r=${r.rev_number}#r${r.rev_number}`,
			vehicleId: r.rev_vehicle_id,
			vehicleName: r.rev_vehicle_name,
		};
	if (r.run_id)
		return {
			label: `the run of ${r.run_vehicle_name} on ${r.run_at ? format(r.run_at, 'd MMM yyyy') : '?'}`,
			href: `${team}/vehicles/${r.run_vehicle_id}/runs?run=${r.run_id}`,
			vehicleId: r.run_vehicle_id,
			vehicleName: r.run_vehicle_name,
		};
	if (r.plan_id)
		return {
			label: `the plan “${r.plan_name}” of ${r.plan_vehicle_name}`,
			href: `${team}/vehicles/${r.plan_vehicle_id}/plans/${r.plan_id}`,
			vehicleId: r.plan_vehicle_id,
			vehicleName: r.plan_vehicle_name,
		};
	return {
		label: r.event_name ?? 'an event',
		href: `${team}/events/${r.event_id}/checks`,
		vehicleId: null,
		vehicleName: null,
	};
}

/** Whether the subject is the team's (a subject of another team is not found). */
export async function subjectInTeam(db: Db, teamId: string, s: ThreadSubject): Promise<boolean> {
	const q =
		s.on === 'revision'
			? db
					.selectFrom('revision as r')
					.innerJoin('build as b', 'b.id', 'r.build_id')
					.innerJoin('vehicle as v', 'v.id', 'b.vehicle_id')
					.select('r.id')
					.where('r.id', '=', s.id)
					.where('v.team_id', '=', teamId)
			: s.on === 'run'
				? db
						.selectFrom('run as r')
						.innerJoin('vehicle as v', 'v.id', 'r.vehicle_id')
						.select('r.id')
						.where('r.id', '=', s.id)
						.where('v.team_id', '=', teamId)
				: s.on === 'plan'
					? db
							.selectFrom('plan as p')
							.innerJoin('vehicle as v', 'v.id', 'p.vehicle_id')
							.select('p.id')
							.where('p.id', '=', s.id)
							.where('v.team_id', '=', teamId)
					: db
							.selectFrom('event')
							.select('id')
							.where('id', '=', s.id)
							.where('team_id', '=', teamId);
	return Boolean(await q.executeTakeFirst());
}

/** The name a comment shows for its author: the account's now, else as written, else the import's. */
export const authorLabel = (r: {
	name: string | null;
	email: string | null;
	author_name: string;
	imported_by: string | null;
}) =>
	r.name ??
	r.email ??
	(r.author_name || (r.imported_by ? `${r.imported_by} (imported)` : 'A former member'));

/** One thread, oldest first. */
export function findThread(db: Db, teamId: string, s: ThreadSubject) {
	return db
		.selectFrom('comment as c')
		.leftJoin('User as u', 'u.id', 'c.author_id')
		.select([
			'c.id',
			'c.author_id',
			'c.author_name',
			'c.imported_by',
			'c.body',
			'c.created_at',
			'c.edited_at',
			'u.name',
			'u.email',
		])
		.where('c.team_id', '=', teamId)
		.where(`c.${SUBJECT_COLUMN[s.on]}`, '=', s.id)
		.orderBy('c.created_at')
		.orderBy('c.id')
		.limit(1000)
		.execute();
}

/** How many comments each of these subjects has (for "Comments (3)" before a thread is opened). */
export async function countComments(
	db: Db,
	teamId: string,
	on: CommentSubjectKind,
	ids: string[],
): Promise<Map<string, number>> {
	if (ids.length === 0) return new Map();
	const column = `c.${SUBJECT_COLUMN[on]}` as const;
	const rows = await db
		.selectFrom('comment as c')
		.select([`${column} as subject`, (eb) => eb.fn.countAll<string>().as('n')])
		.where('c.team_id', '=', teamId)
		.where(column, 'in', ids)
		.groupBy(column)
		.execute();
	return new Map(rows.map((r) => [r.subject as string, Number(r.n)]));
}

/** The team's members by the names a mention uses (the name, else the address before its @). */
export async function mentionableMembers(db: Db, teamId: string): Promise<Mentionable[]> {
	const rows = await db
		.selectFrom('membership as m')
		.innerJoin('User as u', 'u.id', 'm.user_id')
		.select(['u.id', 'u.name', 'u.email'])
		.where('m.team_id', '=', teamId)
		.orderBy('u.name')
		.execute();
	return rows.map((r) => ({ id: r.id, name: r.name?.trim() || r.email.split('@')[0]! }));
}

/** How many comments this person wrote since then (in any team). */
export async function commentsWrittenSince(db: Db, authorId: string, since: Date): Promise<number> {
	const row = await db
		.selectFrom('comment')
		.select((eb) => eb.fn.countAll<string>().as('n'))
		.where('author_id', '=', authorId)
		.where('created_at', '>', since)
		.executeTakeFirstOrThrow();
	return Number(row.n);
}

export function findComment(db: Db, teamId: string, commentId: string) {
	return db
		.selectFrom('comment')
		.selectAll()
		.where('team_id', '=', teamId)
		.where('id', '=', commentId)
		.executeTakeFirst();
}

/** Notifies each member mentioned (once per comment); the ids of the new notifications. */
async function notify(db: Db, teamId: string, commentId: string, userIds: string[]) {
	if (userIds.length === 0) return [];
	const rows = await db
		.insertInto('notification')
		.values(userIds.map((u) => ({ user_id: u, team_id: teamId, comment_id: commentId })))
		.onConflict((oc) => oc.columns(['user_id', 'comment_id']).doNothing())
		.returning('id')
		.execute();
	return rows.map((r) => r.id);
}

/** Writes a comment and its mentions' notifications together. */
export function insertComment(
	db: Db,
	c: { teamId: string; subject: ThreadSubject; authorId: string; authorName: string; body: string },
	mentioned: string[],
) {
	return db.transaction().execute(async (trx) => {
		const row = await trx
			.insertInto('comment')
			.values({
				team_id: c.teamId,
				[SUBJECT_COLUMN[c.subject.on]]: c.subject.id,
				author_id: c.authorId,
				author_name: c.authorName,
				body: c.body,
			})
			.returningAll()
			.executeTakeFirstOrThrow();
		const notifications = await notify(trx, c.teamId, row.id, mentioned);
		return { row, notifications };
	});
}

/** Changes a comment's text; members newly mentioned are notified in the same transaction. */
export function updateComment(
	db: Db,
	teamId: string,
	commentId: string,
	body: string,
	mentioned: string[],
) {
	return db.transaction().execute(async (trx) => {
		const row = await trx
			.updateTable('comment')
			.set({ body, edited_at: new Date() })
			.where('team_id', '=', teamId)
			.where('id', '=', commentId)
			.returningAll()
			.executeTakeFirst();
		if (!row) return null;
		const notifications = await notify(trx, teamId, row.id, mentioned);
		return { row, notifications };
	});
}

export async function deleteComment(db: Db, teamId: string, commentId: string): Promise<boolean> {
	const r = await db
		.deleteFrom('comment')
		.where('team_id', '=', teamId)
		.where('id', '=', commentId)
		.executeTakeFirst();
	return Number(r.numDeletedRows) > 0;
}

export async function viewersMayComment(db: Db, teamId: string): Promise<boolean> {
	const row = await db
		.selectFrom('team')
		.select('viewers_may_comment')
		.where('id', '=', teamId)
		.executeTakeFirst();
	return row?.viewers_may_comment ?? false;
}

/** The team's recent comments, newest first, for its activity. */
export async function recentComments(db: Db, teamId: string, limit: number) {
	const rows = await withSubjects(db)
		.leftJoin('User as u', 'u.id', 'c.author_id')
		.select(['c.body', 'c.created_at', 'c.author_name', 'c.imported_by', 'u.name', 'u.email'])
		.where('c.team_id', '=', teamId)
		.orderBy('c.created_at', 'desc')
		.limit(limit)
		.execute();
	return rows.map((r) => ({ ...r, place: placeOf(r) }));
}

/** Every comment of the team for its backup, oldest first, with the revision's number and vehicle. */
export function findCommentsForBackup(db: Db, teamId: string) {
	return db
		.selectFrom('comment as c')
		.leftJoin('revision as rev', 'rev.id', 'c.revision_id')
		.leftJoin('build as rb', 'rb.id', 'rev.build_id')
		.select([
			'c.revision_id',
			'c.run_id',
			'c.plan_id',
			'c.event_id',
			'rev.number as rev_number',
			'rb.vehicle_id as rev_vehicle_id',
			'c.author_id',
			'c.author_name',
			'c.imported_by',
			'c.body',
			'c.created_at',
			'c.edited_at',
		])
		.where('c.team_id', '=', teamId)
		.orderBy('c.created_at')
		.orderBy('c.id')
		.execute();
}
