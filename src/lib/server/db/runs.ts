import { type Kysely, sql } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import {
	measurementColumns,
	measurementsOf,
	type RunMeasurements,
} from '@/lib/schemas/run-measurements';
import { MISMATCH_MARGIN_V, type RunDto, type RunSample } from '@/lib/schemas/runs';
import { type LoggerPoint, loggerSummary } from '@/lib/logger-summary';

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

function mismatchesOf(r: RunRow): RunDto['mismatches'] {
	const out: RunDto['mismatches'] = [];
	const pairs = [
		['restingV', r.resting_v, r.logger_resting_v],
		['minV', r.min_v, r.logger_min_v],
	] as const;
	for (const [field, typedV, loggedV] of pairs) {
		if (typedV !== null && loggedV !== null && Math.abs(typedV - loggedV) > MISMATCH_MARGIN_V)
			out.push({ field, typedV, loggedV });
	}
	return out;
}

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
		ranAtOffsetMin: r.ran_at_offset_min,
		...measurementsOf(r),
		hasLogger: Boolean(r.has_logger),
		logger: r.logger_min_v === null ? null : { restingV: r.logger_resting_v, minV: r.logger_min_v },
		mismatches: mismatchesOf(r),
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

/** Each vehicle's latest run, one row per vehicle that has run (the team page). */
export async function findLastRuns(db: Db, teamId: string): Promise<RunDto[]> {
	const rows = await runQuery(db, teamId)
		.distinctOn('r.vehicle_id')
		.orderBy('r.vehicle_id')
		.orderBy('r.ran_at', 'desc')
		.execute();
	return rows.map(toRunDto);
}

/** Each vehicle's `perVehicle` latest runs, oldest first (the day page), never the whole season. */
export async function findLatestRuns(
	db: Db,
	teamId: string,
	perVehicle: number,
): Promise<RunDto[]> {
	const { rows } = await sql<{ id: string }>`
		select id from (
			select r.id, row_number() over (partition by r.vehicle_id order by r.ran_at desc, r.id desc) n
			from run r join vehicle v on v.id = r.vehicle_id
			where v.team_id = ${teamId}
		) latest where n <= ${perVehicle}`.execute(db);
	if (rows.length === 0) return [];
	const found = await runQuery(db, teamId)
		.where(
			'r.id',
			'in',
			rows.map((r) => r.id),
		)
		.orderBy('r.ran_at')
		.orderBy('r.id')
		.execute();
	return found.map(toRunDto);
}

/**
 * The season chart's points: each vehicle's best score of each day it scored (the time of that
 * run), oldest first. A day of twenty runs is one point, so the chart carries what it can show
 * whatever the season's volume.
 */
export async function findDailyBestScores(
	db: Db,
	teamId: string,
): Promise<{ vehicleName: string; ranAt: string; scoreDb: number; runs: number }[]> {
	const { rows } = await sql<{
		vehicle_name: string;
		ran_at: Date;
		score_db: number;
		runs: number;
	}>`
		select v.name vehicle_name,
			(array_agg(r.ran_at order by r.score_db desc, r.ran_at))[1] ran_at,
			max(r.score_db) score_db,
			count(*)::int runs
		from run r join vehicle v on v.id = r.vehicle_id
		where v.team_id = ${teamId} and r.score_db is not null
		group by v.id, v.name, date_trunc('day', r.ran_at)
		order by 2`.execute(db);
	return rows.map((r) => ({
		vehicleName: r.vehicle_name,
		ranAt: new Date(r.ran_at).toISOString(),
		scoreDb: r.score_db,
		runs: r.runs,
	}));
}

/**
 * One page of runs, oldest first within it: the `limit` newest runs before `before` (all times
 * when absent), and whether older ones remain.
 */
export async function findRunsPage(
	db: Db,
	teamId: string,
	filter: {
		vehicleId?: string;
		eventId?: string;
		limit: number;
		before?: string;
		beforeId?: string;
	},
): Promise<{ runs: RunDto[]; more: boolean }> {
	let q = runQuery(db, teamId);
	if (filter.vehicleId) q = q.where('r.vehicle_id', '=', filter.vehicleId);
	if (filter.eventId) q = q.where('r.event_id', '=', filter.eventId);
	if (filter.before)
		q = filter.beforeId
			? q.where(sql<boolean>`(r.ran_at, r.id) < (${new Date(filter.before)}, ${filter.beforeId})`)
			: q.where('r.ran_at', '<', new Date(filter.before));
	const rows = await q
		.orderBy('r.ran_at', 'desc')
		.orderBy('r.id', 'desc')
		.limit(filter.limit + 1)
		.execute();
	const more = rows.length > filter.limit;
	return { runs: rows.slice(0, filter.limit).reverse().map(toRunDto), more };
}

export async function findRun(db: Db, teamId: string, runId: string): Promise<RunDto | undefined> {
	const r = await runQuery(db, teamId).where('r.id', '=', runId).executeTakeFirst();
	return r && toRunDto(r);
}

/** The run a device already made with this idempotency key, if any. */
export async function findRunByClientKey(
	db: Db,
	vehicleId: string,
	clientKey: string,
): Promise<string | undefined> {
	const row = await db
		.selectFrom('run')
		.select('id')
		.where('vehicle_id', '=', vehicleId)
		.where('client_key', '=', clientKey)
		.executeTakeFirst();
	return row?.id;
}

/** A run of the vehicle in the same second with the same score (null matching null): a likely duplicate. */
export async function findLikelyDuplicate(
	db: Db,
	teamId: string,
	vehicleId: string,
	ranAt: string,
	scoreDb: number | null | undefined,
	/** The caller's own client key: a run made with it is the same run, never its duplicate. */
	clientKey?: string,
): Promise<RunDto | undefined> {
	const r = await runQuery(db, teamId)
		.where('r.vehicle_id', '=', vehicleId)
		.$if(clientKey !== undefined, (q) =>
			q.where(sql<boolean>`r.client_key is distinct from ${clientKey ?? null}::uuid`),
		)
		.where(
			sql<Date>`date_trunc('second', r.ran_at)`,
			'=',
			sql<Date>`date_trunc('second', ${ranAt}::timestamptz)`,
		)
		.where(sql<boolean>`r.score_db is not distinct from ${scoreDb ?? null}::double precision`)
		.executeTakeFirst();
	return r && toRunDto(r);
}

/**
 * Logs a run. With a client key the insert is idempotent: a second insert with the same key (a
 * retry from a device that never saw the answer) makes nothing and answers the first run's id.
 */
export async function insertRun(
	db: Db,
	r: Partial<RunMeasurements> & {
		vehicleId: string;
		eventId: string | null;
		revisionId: string | null;
		ranAt: string;
		ranAtOffsetMin: number | null;
		clientKey?: string;
		authorId: string;
	},
): Promise<{ id: string; created: boolean }> {
	const row = await db
		.insertInto('run')
		.values({
			vehicle_id: r.vehicleId,
			event_id: r.eventId,
			revision_id: r.revisionId,
			ran_at: r.ranAt,
			ran_at_offset_min: r.ranAtOffsetMin,
			client_key: r.clientKey ?? null,
			...measurementColumns(r),
			author_id: r.authorId,
		})
		.onConflict((oc) =>
			oc.columns(['vehicle_id', 'client_key']).where('client_key', 'is not', null).doNothing(),
		)
		.returning('id')
		.executeTakeFirst();
	if (row) return { id: row.id, created: true };
	const existing = await findRunByClientKey(db, r.vehicleId, r.clientKey!);
	return { id: existing!, created: false };
}

/** Stores the logger's resting and minimum voltage of a run, worked out from its samples in hand. */
export async function storeLoggerSummary(
	db: Db,
	runId: string,
	samples: readonly LoggerPoint[],
): Promise<void> {
	const summary = loggerSummary(samples);
	await db
		.updateTable('run')
		.set({ logger_min_v: summary?.minV ?? null, logger_resting_v: summary?.restingV ?? null })
		.where('id', '=', runId)
		.execute();
}

/**
 * The statement that clears a run's old samples before a new file's are written: it names the run,
 * so it reaches `run_sample` through the run's index range (the primary key leads with `run_id`).
 */
export const clearSamplesQuery = (db: Db, runId: string) =>
	db.deleteFrom('run_sample').where('run_id', '=', runId);

/** Changes a run's links and measurements; fields left out stay as they are. */
export async function updateRun(
	db: Db,
	runId: string,
	r: Partial<RunMeasurements> & {
		eventId?: string | null;
		ranAt?: string;
		ranAtOffsetMin?: number | null;
		revisionId: string | null;
	},
): Promise<void> {
	await db
		.updateTable('run')
		.set({
			...(r.eventId !== undefined ? { event_id: r.eventId } : {}),
			...(r.ranAt ? { ran_at: r.ranAt } : {}),
			...(r.ranAtOffsetMin !== undefined ? { ran_at_offset_min: r.ranAtOffsetMin } : {}),
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
		await clearSamplesQuery(trx, p.runId).execute();
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
		await storeLoggerSummary(trx, p.runId, p.samples);
		return { ok: true, replacedKeys: old.map((f) => f.object_key) };
	});
}
