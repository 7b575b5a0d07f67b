import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import type { EventDto } from '@/lib/schemas/events';

type Db = Kysely<Database>;

type EventFields = Omit<EventDto, 'id'>;

export async function findEvents(db: Db, teamId: string): Promise<EventDto[]> {
	const rows = await db
		.selectFrom('event')
		.selectAll()
		.where('team_id', '=', teamId)
		.orderBy('starts_on')
		.execute();
	return rows.map((e) => ({
		id: e.id,
		name: e.name,
		startsOn: e.starts_on,
		endsOn: e.ends_on,
		place: e.place,
		format: e.format,
		notes: e.notes,
	}));
}

export function findEvent(db: Db, teamId: string, eventId: string) {
	return db
		.selectFrom('event')
		.selectAll()
		.where('team_id', '=', teamId)
		.where('id', '=', eventId)
		.executeTakeFirst();
}

export async function insertEvent(db: Db, teamId: string, e: EventFields): Promise<string> {
	const row = await db
		.insertInto('event')
		.values({
			team_id: teamId,
			name: e.name,
			starts_on: e.startsOn,
			ends_on: e.endsOn,
			place: e.place,
			format: e.format,
			notes: e.notes,
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	return row.id;
}

export async function updateEvent(db: Db, eventId: string, e: Partial<EventFields>): Promise<void> {
	const { startsOn, endsOn, ...rest } = e;
	await db
		.updateTable('event')
		.set({
			...rest,
			...(startsOn ? { starts_on: startsOn } : {}),
			...(endsOn ? { ends_on: endsOn } : {}),
		})
		.where('id', '=', eventId)
		.execute();
}

/** Deletes an event; its runs stay (they lose the event link). */
export async function deleteEvent(db: Db, eventId: string): Promise<void> {
	await db.deleteFrom('event').where('id', '=', eventId).execute();
}
