import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';

type Db = Kysely<Database>;

/**
 * What a streamed backup reads up front: the team and its small tables, each vehicle's revision
 * numbers (not documents), the runs' rows (not samples) and the sign-offs. Documents, samples and
 * files are read a vehicle or a batch of runs at a time (below), so memory holds one slice.
 */
export async function readTeamOutline(db: Db, teamId: string) {
	const team = await db
		.selectFrom('team')
		.selectAll()
		.where('id', '=', teamId)
		.executeTakeFirstOrThrow();
	const [members, items, vehicles, events] = await Promise.all([
		db
			.selectFrom('membership as m')
			.innerJoin('User as u', 'u.id', 'm.user_id')
			.select(['u.email', 'u.name', 'm.role'])
			.where('m.team_id', '=', teamId)
			.orderBy('u.email')
			.execute(),
		db
			.selectFrom('check_item')
			.selectAll()
			.where('team_id', '=', teamId)
			.orderBy('created_at')
			.orderBy('label')
			.orderBy('id')
			.execute(),
		db
			.selectFrom('vehicle as v')
			.innerJoin('build as b', 'b.vehicle_id', 'v.id')
			.selectAll('v')
			.select(['b.id as build_id', 'b.head_revision_id'])
			.where('v.team_id', '=', teamId)
			.orderBy('v.created_at')
			.orderBy('v.name')
			.orderBy('v.id')
			.execute(),
		db
			.selectFrom('event')
			.selectAll()
			.where('team_id', '=', teamId)
			.orderBy('starts_on')
			.orderBy('name')
			.orderBy('created_at')
			.orderBy('id')
			.execute(),
	]);
	const buildIds = vehicles.map((v) => v.build_id);
	const vehicleIds = vehicles.map((v) => v.id);
	const [revisionNumbers, runs, signoffs] = await Promise.all([
		buildIds.length
			? db
					.selectFrom('revision')
					.select(['id', 'number', 'author_id'])
					.where('build_id', 'in', buildIds)
					.execute()
			: [],
		vehicleIds.length
			? db
					.selectFrom('run')
					.selectAll()
					.where('vehicle_id', 'in', vehicleIds)
					.orderBy('ran_at')
					.orderBy('created_at')
					.orderBy('id')
					.execute()
			: [],
		events.length
			? db
					.selectFrom('check_signoff')
					.selectAll()
					.where(
						'event_id',
						'in',
						events.map((e) => e.id),
					)
					.orderBy('signed_at')
					.orderBy('item_key')
					.execute()
			: [],
	]);
	return { team, members, items, vehicles, events, revisionNumbers, runs, signoffs };
}

/** The e-mail addresses of the accounts named by `ids` (authors, owners, signers). */
export async function emailsOf(db: Db, ids: string[]): Promise<Map<string, string>> {
	const unique = [...new Set(ids)];
	if (unique.length === 0) return new Map();
	const rows = await db
		.selectFrom('User')
		.select(['id', 'email'])
		.where('id', 'in', unique)
		.execute();
	return new Map(rows.map((u) => [u.id, u.email]));
}

/** One vehicle's revisions with their documents, oldest first. */
export function readBuildRevisions(db: Db, buildId: string) {
	return db
		.selectFrom('revision')
		.selectAll()
		.where('build_id', '=', buildId)
		.orderBy('number')
		.execute();
}

/** One vehicle's plans with their documents and parts. */
export async function readVehiclePlans(db: Db, vehicleId: string) {
	const plans = await db
		.selectFrom('plan')
		.selectAll()
		.where('vehicle_id', '=', vehicleId)
		.orderBy('created_at')
		.orderBy('name')
		.orderBy('id')
		.execute();
	const parts = plans.length
		? await db
				.selectFrom('plan_part')
				.selectAll()
				.where(
					'plan_id',
					'in',
					plans.map((p) => p.id),
				)
				.orderBy('position')
				.execute()
		: [];
	return { plans, partsByPlan: groupBy(parts, (x) => x.plan_id) };
}

/** The samples and stored files of a batch of runs. */
export async function readRunsDetail(db: Db, runIds: string[]) {
	if (runIds.length === 0) return { samplesByRun: new Map(), filesByRun: new Map() };
	const [samples, files] = await Promise.all([
		db
			.selectFrom('run_sample')
			.select(['run_id', 't_s', 'volts', 'amps'])
			.where('run_id', 'in', runIds)
			.orderBy('run_id')
			.orderBy('seq')
			.execute(),
		db
			.selectFrom('stored_file')
			.selectAll()
			.where('run_id', 'in', runIds)
			.orderBy('created_at')
			.orderBy('kind')
			.orderBy('object_key')
			.execute(),
	]);
	return {
		samplesByRun: groupBy(samples, (x) => x.run_id),
		filesByRun: groupBy(files, (f) => f.run_id!),
	};
}

function groupBy<T>(rows: T[], key: (row: T) => string): Map<string, T[]> {
	const out = new Map<string, T[]>();
	for (const row of rows) {
		const k = key(row);
		const list = out.get(k);
		if (list) list.push(row);
		else out.set(k, [row]);
	}
	return out;
}
