import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';

type Db = Kysely<Database>;

export interface EventDto {
	id: string;
	name: string;
	startsOn: string;
	endsOn: string;
	place: string;
	format: string;
	notes: string;
}

/** What a run measured, as the API and the backup file name it. */
export interface RunMeasurements {
	scoreDb: number | null;
	frequencyHz: number | null;
	restingV: number | null;
	minV: number | null;
	ambientC: number | null;
	notes: string;
}

type MeasurementColumns = { score_db: number | null; frequency_hz: number | null; resting_v: number | null; min_v: number | null; ambient_c: number | null; notes: string };

const MEASUREMENT_COLUMNS = { scoreDb: 'score_db', frequencyHz: 'frequency_hz', restingV: 'resting_v', minV: 'min_v', ambientC: 'ambient_c', notes: 'notes' } as const;

/** The run table's columns for the measurements given (absent ones are left out, for partial updates). */
export function measurementColumns(m: Partial<RunMeasurements>): Partial<MeasurementColumns> {
	const out: Record<string, unknown> = {};
	for (const [field, column] of Object.entries(MEASUREMENT_COLUMNS)) if (m[field as keyof RunMeasurements] !== undefined) out[column] = m[field as keyof RunMeasurements];
	return out as Partial<MeasurementColumns>;
}

export function measurementsOf(r: MeasurementColumns): RunMeasurements {
	return { scoreDb: r.score_db, frequencyHz: r.frequency_hz, restingV: r.resting_v, minV: r.min_v, ambientC: r.ambient_c, notes: r.notes };
}

export interface RunDto extends RunMeasurements {
	id: string;
	vehicleId: string;
	vehicleName: string;
	eventId: string | null;
	eventName: string | null;
	revisionId: string | null;
	revisionNumber: number | null;
	ranAt: string;
	hasLogger: boolean;
}

export async function findEvents(db: Db, teamId: string): Promise<EventDto[]> {
	const rows = await db.selectFrom('event').selectAll().where('team_id', '=', teamId).orderBy('starts_on').execute();
	return rows.map((e) => ({ id: e.id, name: e.name, startsOn: e.starts_on, endsOn: e.ends_on, place: e.place, format: e.format, notes: e.notes }));
}

export function findEvent(db: Db, teamId: string, eventId: string) {
	return db.selectFrom('event').selectAll().where('team_id', '=', teamId).where('id', '=', eventId).executeTakeFirst();
}

function runQuery(db: Db, teamId: string) {
	return db
		.selectFrom('run as r')
		.innerJoin('vehicle as v', 'v.id', 'r.vehicle_id')
		.leftJoin('event as e', 'e.id', 'r.event_id')
		.leftJoin('revision as rev', 'rev.id', 'r.revision_id')
		.selectAll('r')
		.select(['v.name as vehicle_name', 'e.name as event_name', 'rev.number as revision_number'])
		.select((eb) => eb.exists(eb.selectFrom('run_sample as s').whereRef('s.run_id', '=', 'r.id').select('s.seq')).as('has_logger'))
		.where('v.team_id', '=', teamId);
}

type RunRow = Awaited<ReturnType<ReturnType<typeof runQuery>['executeTakeFirstOrThrow']>>;

function toRunDto(r: RunRow): RunDto {
	return {
		id: r.id,
		vehicleId: r.vehicle_id,
		vehicleName: r.vehicle_name,
		eventId: r.event_id,
		eventName: r.event_name,
		revisionId: r.revision_id,
		revisionNumber: r.revision_number,
		ranAt: r.ran_at.toISOString(),
		...measurementsOf(r),
		hasLogger: Boolean(r.has_logger),
	};
}

export async function findRuns(db: Db, teamId: string, filter: { vehicleId?: string; eventId?: string } = {}): Promise<RunDto[]> {
	let q = runQuery(db, teamId);
	if (filter.vehicleId) q = q.where('r.vehicle_id', '=', filter.vehicleId);
	if (filter.eventId) q = q.where('r.event_id', '=', filter.eventId);
	return (await q.orderBy('r.ran_at').execute()).map(toRunDto);
}

export async function findRun(db: Db, teamId: string, runId: string): Promise<RunDto | undefined> {
	const r = await runQuery(db, teamId).where('r.id', '=', runId).executeTakeFirst();
	return r && toRunDto(r);
}

/** The revision of a vehicle's build that was the newest at a moment (the configuration in force). */
export async function revisionInForce(db: Db, vehicleId: string, at: Date): Promise<string | null> {
	const row = await db
		.selectFrom('revision as r')
		.innerJoin('build as b', 'b.id', 'r.build_id')
		.select('r.id')
		.where('b.vehicle_id', '=', vehicleId)
		.where('r.created_at', '<=', at)
		.orderBy('r.created_at', 'desc')
		.limit(1)
		.executeTakeFirst();
	return row?.id ?? null;
}

export async function revisionBelongsTo(db: Db, vehicleId: string, revisionId: string): Promise<boolean> {
	const row = await db.selectFrom('revision as r').innerJoin('build as b', 'b.id', 'r.build_id').select('r.id').where('b.vehicle_id', '=', vehicleId).where('r.id', '=', revisionId).executeTakeFirst();
	return Boolean(row);
}

export async function findSamples(db: Db, runId: string) {
	const rows = await db.selectFrom('run_sample').select(['t_s', 'volts', 'amps']).where('run_id', '=', runId).orderBy('seq').execute();
	return rows.map((r) => ({ tS: r.t_s, volts: r.volts, amps: r.amps }));
}
