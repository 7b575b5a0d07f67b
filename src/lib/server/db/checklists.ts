import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import type { CheckItemDto } from '@/lib/schemas/teams';

type Db = Kysely<Database>;

/** The team's manual check items, oldest first. */
export function findCheckItems(db: Db, teamId: string): Promise<CheckItemDto[]> {
	return db
		.selectFrom('check_item')
		.select(['id', 'label'])
		.where('team_id', '=', teamId)
		.orderBy('created_at')
		.execute();
}

export function insertCheckItem(db: Db, teamId: string, label: string): Promise<CheckItemDto> {
	return db
		.insertInto('check_item')
		.values({ team_id: teamId, label })
		.returning(['id', 'label'])
		.executeTakeFirstOrThrow();
}

/** A vehicle of the team with its build's id (what a checklist is computed from). */
export function findVehicleWithBuild(db: Db, teamId: string, vehicleId: string) {
	return db
		.selectFrom('vehicle as v')
		.innerJoin('build as b', 'b.vehicle_id', 'v.id')
		.select(['v.id', 'v.name', 'v.competition_class', 'b.id as build_id'])
		.where('v.team_id', '=', teamId)
		.where('v.id', '=', vehicleId)
		.executeTakeFirst();
}

/** Who signed off which item of a vehicle's checklist for an event. */
export function findSignoffs(db: Db, eventId: string, vehicleId: string) {
	return db
		.selectFrom('check_signoff as s')
		.leftJoin('User as u', 'u.id', 's.signed_by')
		.leftJoin('revision as r', 'r.id', 's.revision_id')
		.select([
			's.revision_id',
			's.waived_value',
			's.waived_reasons',
			'r.number as revision_number',
			's.item_key',
			's.signed_at',
			's.note',
			's.waived',
			's.imported_by',
			'u.name',
			'u.email',
		])
		.where('s.event_id', '=', eventId)
		.where('s.vehicle_id', '=', vehicleId)
		.execute();
}

/** Every sign-off given for an event, all vehicles: the vehicle id with each. */
export function findEventSignoffs(db: Db, eventId: string) {
	return db
		.selectFrom('check_signoff as s')
		.leftJoin('User as u', 'u.id', 's.signed_by')
		.leftJoin('revision as r', 'r.id', 's.revision_id')
		.select([
			's.revision_id',
			's.waived_value',
			's.waived_reasons',
			'r.number as revision_number',
			's.vehicle_id',
			's.item_key',
			's.signed_at',
			's.note',
			's.waived',
			's.imported_by',
			'u.name',
			'u.email',
		])
		.where('s.event_id', '=', eventId)
		.execute();
}

/**
 * Signs an item off (again: the newest sign-off replaces the older one). A waiver is a captain's
 * sign-off of a failing computed item, with the reason in the note.
 */
export async function upsertSignoff(
	db: Db,
	s: {
		eventId: string;
		vehicleId: string;
		itemKey: string;
		signedBy: string;
		note: string;
		waived: boolean;
		/** The revision in force, and for a waiver what it accepts (the figure, the findings). */
		revisionId?: string | null;
		waivedValue?: number | null;
		waivedReasons?: string[] | null;
	},
): Promise<void> {
	const scope = {
		revision_id: s.revisionId ?? null,
		waived_value: s.waivedValue ?? null,
		waived_reasons: s.waivedReasons ? JSON.stringify(s.waivedReasons) : null,
	};
	await db
		.insertInto('check_signoff')
		.values({
			event_id: s.eventId,
			vehicle_id: s.vehicleId,
			item_key: s.itemKey,
			signed_by: s.signedBy,
			note: s.note,
			waived: s.waived,
			...scope,
		})
		.onConflict((oc) =>
			oc.columns(['event_id', 'vehicle_id', 'item_key']).doUpdateSet({
				signed_by: s.signedBy,
				signed_at: new Date(),
				note: s.note,
				waived: s.waived,
				...scope,
			}),
		)
		.execute();
}

export async function removeSignoff(
	db: Db,
	s: { eventId: string; vehicleId: string; itemKey: string },
): Promise<void> {
	await db
		.deleteFrom('check_signoff')
		.where('event_id', '=', s.eventId)
		.where('vehicle_id', '=', s.vehicleId)
		.where('item_key', '=', s.itemKey)
		.execute();
}
