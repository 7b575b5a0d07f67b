import type { Kysely } from 'kysely';
import type { Database, VehicleRow } from '@/lib/server/db/schema';
import type { VehicleDto } from '@/lib/schemas/vehicles';

type Db = Kysely<Database>;

export function toVehicleDto(v: VehicleRow, headRevisionId: string | null): VehicleDto {
	return {
		id: v.id,
		name: v.name,
		description: v.description,
		competitionClass: v.competition_class,
		notes: v.notes,
		ownerId: v.owner_id,
		archived: v.archived_at !== null,
		createdAt: v.created_at.toISOString(),
		headRevisionId,
	};
}

export function findVehicle(db: Db, teamId: string, vehicleId: string) {
	return db
		.selectFrom('vehicle')
		.selectAll()
		.where('team_id', '=', teamId)
		.where('id', '=', vehicleId)
		.executeTakeFirst();
}

/** A vehicle of the team with its build, in one query (every vehicle has one build). */
export async function findVehicleAndBuild(db: Db, teamId: string, vehicleId: string) {
	const row = await db
		.selectFrom('vehicle as v')
		.innerJoin('build as b', 'b.vehicle_id', 'v.id')
		.selectAll('v')
		.select([
			'b.id as build_id',
			'b.head_revision_id as build_head_revision_id',
			'b.created_at as build_created_at',
		])
		.where('v.team_id', '=', teamId)
		.where('v.id', '=', vehicleId)
		.executeTakeFirst();
	if (!row) return undefined;
	const { build_id, build_head_revision_id, build_created_at, ...vehicle } = row;
	return {
		vehicle,
		build: {
			id: build_id,
			vehicle_id: vehicle.id,
			head_revision_id: build_head_revision_id,
			created_at: build_created_at,
		},
	};
}

/** The team's vehicles in use (not archived), by name. */
export function findVehiclesForTeam(db: Db, teamId: string) {
	return db
		.selectFrom('vehicle')
		.selectAll()
		.where('team_id', '=', teamId)
		.where('archived_at', 'is', null)
		.orderBy('name')
		.execute();
}

/** The team's vehicles in use, or its archived ones, as the API sends them. */
export async function listVehicles(
	db: Db,
	teamId: string,
	archived: boolean,
): Promise<VehicleDto[]> {
	const rows = await db
		.selectFrom('vehicle as v')
		.innerJoin('build as b', 'b.vehicle_id', 'v.id')
		.selectAll('v')
		.select('b.head_revision_id')
		.where('v.team_id', '=', teamId)
		.where('v.archived_at', archived ? 'is not' : 'is', null)
		.orderBy('v.name')
		.execute();
	return rows.map((r) => toVehicleDto(r, r.head_revision_id));
}

export interface VehicleChanges {
	name?: string;
	description?: string;
	competitionClass?: string;
	notes?: string;
	ownerId?: string | null;
	archived?: boolean;
}

export function updateVehicle(db: Db, vehicleId: string, c: VehicleChanges): Promise<VehicleRow> {
	const { archived, competitionClass, ownerId, ...rest } = c;
	return db
		.updateTable('vehicle')
		.set({
			...rest,
			...(competitionClass !== undefined ? { competition_class: competitionClass } : {}),
			...(ownerId !== undefined ? { owner_id: ownerId } : {}),
			...(archived !== undefined ? { archived_at: archived ? new Date() : null } : {}),
		})
		.where('id', '=', vehicleId)
		.returningAll()
		.executeTakeFirstOrThrow();
}

/** Creates a vehicle with its (empty) build, in one transaction. */
export async function insertVehicleWithBuild(
	db: Db,
	v: {
		teamId: string;
		name: string;
		description: string;
		competitionClass: string;
		notes: string;
		ownerId: string | null;
	},
) {
	return db.transaction().execute(async (trx) => {
		const vehicle = await trx
			.insertInto('vehicle')
			.values({
				team_id: v.teamId,
				name: v.name,
				description: v.description,
				competition_class: v.competitionClass,
				notes: v.notes,
				owner_id: v.ownerId,
			})
			.returningAll()
			.executeTakeFirstOrThrow();
		const build = await trx
			.insertInto('build')
			.values({ vehicle_id: vehicle.id })
			.returning('id')
			.executeTakeFirstOrThrow();
		return { vehicle, buildId: build.id };
	});
}

/** Each vehicle of the team in use with its head revision (document included), if it has one. */
export function findVehiclesWithHead(db: Db, teamId: string) {
	return db
		.selectFrom('vehicle as v')
		.innerJoin('build as b', 'b.vehicle_id', 'v.id')
		.leftJoin('revision as r', 'r.id', 'b.head_revision_id')
		.select([
			'v.id',
			'v.name',
			'v.description',
			'v.competition_class',
			'r.id as revision_id',
			'r.number as revision_number',
			'r.message as revision_message',
			'r.created_at as revision_created_at',
		])
		.where('v.team_id', '=', teamId)
		.where('v.archived_at', 'is', null)
		.orderBy('v.name')
		.execute();
}
