import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loggerSummary } from '../../src/lib/logger-summary';
import { clearSamplesQuery, insertRun, storeLoggerSummary } from '../../src/lib/server/db/runs';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import { makeTeam, makeUser } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

/**
 * A logger upload touches only its own run's samples: its summary is worked out from the file's
 * samples in hand (no statement reads `run_sample` back), and clearing the run's old samples
 * reaches the table through its index on the run, never a sequential scan of every team's samples.
 */
describe('the logger summary of one run', () => {
	let t: TestDb;
	let runId: string;
	let mine: { run_id: string; seq: number; t_s: number; volts: number; amps: number }[];
	beforeAll(async () => {
		t = await createTestDb();
		const teamId = await makeTeam(t.db, 'Summary Team');
		const author = await makeUser(t.db, 'summary@sagwise.test', 'Summary');
		const { vehicle } = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Logger car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		const run = async () =>
			(
				await insertRun(t.db, {
					vehicleId: vehicle.id,
					eventId: null,
					revisionId: null,
					ranAt: new Date().toISOString(),
					ranAtOffsetMin: 0,
					authorId: author.id,
				})
			).id;
		runId = await run();
		const other = await run();
		// This run: 1 s resting at 12.8 V, then a burp at 400 A pulling the bank to 11.9 V.
		mine = Array.from({ length: 300 }, (_, i) => ({
			run_id: runId,
			seq: i,
			t_s: i / 100,
			volts: i < 100 ? 12.8 : 11.9,
			amps: i < 100 ? 5 : 400,
		}));
		// Another run's samples, many more of them, that the summary must not read.
		const theirs = Array.from({ length: 20_000 }, (_, i) => ({
			run_id: other,
			seq: i,
			t_s: i / 100,
			volts: 10,
			amps: (i % 7) * 100,
		}));
		for (let i = 0; i < theirs.length; i += 5000)
			await t.db
				.insertInto('run_sample')
				.values(theirs.slice(i, i + 5000))
				.execute();
		await t.db.insertInto('run_sample').values(mine).execute();
		await sql`analyze run_sample`.execute(t.db);
	});
	afterAll(async () => t?.drop());

	it('stores the resting and the lowest voltage of the run’s own samples', async () => {
		await storeLoggerSummary(
			t.db,
			runId,
			mine.map((x) => ({ tS: x.t_s, volts: x.volts, amps: x.amps })),
		);
		const row = await t.db
			.selectFrom('run')
			.select(['logger_min_v', 'logger_resting_v'])
			.where('id', '=', runId)
			.executeTakeFirstOrThrow();
		expect(row.logger_min_v).toBeCloseTo(11.9, 9);
		expect(row.logger_resting_v).toBeCloseTo(12.8, 9);
	});

	it('has no resting voltage for a file that starts mid-burp, and none at all for no samples', () => {
		// Worked by hand: the current's halfway mark is 206 A, reached by the first sample.
		expect(
			loggerSummary([
				{ tS: 0, volts: 11.8, amps: 400 },
				{ tS: 0.1, volts: 12.6, amps: 12 },
			]),
		).toEqual({ minV: 11.8, restingV: null });
		expect(loggerSummary([])).toBeNull();
	});

	it('clears a run’s old samples through the run’s index only (EXPLAIN)', async () => {
		const compiled = clearSamplesQuery(t.db, runId).compile();
		const plan = await t.db.transaction().execute(async (trx) => {
			const { rows } = await sql<{ 'QUERY PLAN': unknown }>`explain (format json) ${sql.raw(
				compiled.sql.replace('$1', `'${runId}'::uuid`),
			)}`.execute(trx);
			return JSON.stringify(rows[0]!['QUERY PLAN']);
		});
		const nodes: { type: string; relation?: string; cond?: string }[] = [];
		const walk = (n: Record<string, unknown>) => {
			nodes.push({
				type: String(n['Node Type']),
				relation: n['Relation Name'] as string | undefined,
				cond: (n['Index Cond'] ?? n['Recheck Cond']) as string | undefined,
			});
			for (const child of (n['Plans'] as Record<string, unknown>[] | undefined) ?? []) walk(child);
		};
		walk((JSON.parse(plan) as { Plan: Record<string, unknown> }[])[0]!.Plan);
		const samples = nodes.filter((n) => n.relation === 'run_sample' && /Scan/.test(n.type));
		expect(samples.length).toBeGreaterThanOrEqual(1);
		for (const n of samples) {
			expect(n.type).not.toBe('Seq Scan');
			expect(n.cond).toMatch(/run_id/);
		}
	});
});
