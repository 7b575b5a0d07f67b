import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import {
	measurementColumns,
	measurementsOf,
	type RunMeasurements,
} from '@/lib/schemas/run-measurements';
import type { RunDto, RunSample } from '@/lib/schemas/runs';

type Db = Kysely<Database>;

function runQuery(db: Db, teamId: string) {
	return db
		.selectFrom('run as r')
		.innerJoin('vehicle as v', 'v.id', 'r.vehicle_id')
		.leftJoin('event as e', 'e.id', 'r.event_id')
		.leftJoin('revision as rev', 'rev.id', 'r.revision_id')
		.selectAll('r')
		.select(['v.name as vehicle_name', 'e.name as event_name', 'rev.number as revision_number'])
		.select((eb) =>
			eb
				.exists(eb.selectFrom('run_sample as s').whereRef('s.run_id', '=', 'r.id').select('s.seq'))
				.as('has_logger'),
		)
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

export async function findRuns(
	db: Db,
	teamId: string,
	filter: { vehicleId?: string; eventId?: string } = {},
): Promise<RunDto[]> {
	let q = runQuery(db, teamId);
	if (filter.vehicleId) q = q.where('r.vehicle_id', '=', filter.vehicleId);
	if (filter.eventId) q = q.where('r.event_id', '=', filter.eventId);
	return (await q.orderBy('r.ran_at').execute()).map(toRunDto);
}

export async function findRun(db: Db, teamId: string, runId: string): Promise<RunDto | undefined> {
	const r = await runQuery(db, teamId).where('r.id', '=', runId).executeTakeFirst();
	return r && toRunDto(r);
}

export async function insertRun(
	db: Db,
	r: Partial<RunMeasurements> & {
		vehicleId: string;
		eventId: string | null;
		revisionId: string | null;
		ranAt: string;
		authorId: string;
	},
): Promise<string> {
	const row = await db
		.insertInto('run')
		.values({
			vehicle_id: r.vehicleId,
			event_id: r.eventId,
			revision_id: r.revisionId,
			ran_at: r.ranAt,
			...measurementColumns(r),
			author_id: r.authorId,
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	return row.id;
}

/** Changes a run's links and measurements; fields left out stay as they are. */
export async function updateRun(
	db: Db,
	runId: string,
	r: Partial<RunMeasurements> & {
		eventId?: string | null;
		ranAt?: string;
		revisionId: string | null;
	},
): Promise<void> {
	await db
		.updateTable('run')
		.set({
			...(r.eventId !== undefined ? { event_id: r.eventId } : {}),
			...(r.ranAt ? { ran_at: r.ranAt } : {}),
			revision_id: r.revisionId,
			...measurementColumns(r),
		})
		.where('id', '=', runId)
		.execute();
}

/** Deletes a run; its samples and file rows go with it (ON DELETE CASCADE). */
export async function deleteRun(db: Db, runId: string): Promise<void> {
	await db.deleteFrom('run').where('id', '=', runId).execute();
}

export async function findSamples(db: Db, runId: string): Promise<RunSample[]> {
	const rows = await db
		.selectFrom('run_sample')
		.select(['t_s', 'volts', 'amps'])
		.where('run_id', '=', runId)
		.orderBy('seq')
		.execute();
	return rows.map((r) => ({ tS: r.t_s, volts: r.volts, amps: r.amps }));
}

export type ReplaceLoggerResult =
	{ ok: true; replacedKeys: string[] } | { ok: false; reason: 'busy' };

/**
 * Puts a new logger file in place of a run's old one, in one transaction: the run row is locked
 * (a second upload at the same time is told it is busy), the old samples and file row go, the new
 * ones come in. Answers the object keys of the replaced files, for the caller to remove from storage.
 */
export async function replaceLoggerData(
	db: Db,
	p: {
		teamId: string;
		runId: string;
		objectKey: string;
		fileName: string;
		sizeBytes: number;
		samples: RunSample[];
	},
): Promise<ReplaceLoggerResult> {
	return db.transaction().execute(async (trx): Promise<ReplaceLoggerResult> => {
		const locked = await trx
			.selectFrom('run')
			.select('id')
			.where('id', '=', p.runId)
			.forUpdate()
			.skipLocked()
			.executeTakeFirst();
		if (!locked) return { ok: false, reason: 'busy' };
		const old = await trx
			.selectFrom('stored_file')
			.select('object_key')
			.where('run_id', '=', p.runId)
			.where('kind', '=', 'logger')
			.execute();
		await trx.deleteFrom('run_sample').where('run_id', '=', p.runId).execute();
		await trx
			.deleteFrom('stored_file')
			.where('run_id', '=', p.runId)
			.where('kind', '=', 'logger')
			.execute();
		await trx
			.insertInto('stored_file')
			.values({
				team_id: p.teamId,
				run_id: p.runId,
				kind: 'logger',
				object_key: p.objectKey,
				file_name: p.fileName,
				content_type: 'text/csv',
				size_bytes: p.sizeBytes,
			})
			.execute();
		for (let i = 0; i < p.samples.length; i += 1000) {
			await trx
				.insertInto('run_sample')
				.values(
					p.samples.slice(i, i + 1000).map((s, j) => ({
						run_id: p.runId,
						seq: i + j,
						t_s: s.tS,
						volts: s.volts,
						amps: s.amps,
					})),
				)
				.execute();
		}
		return { ok: true, replacedKeys: old.map((f) => f.object_key) };
	});
}
