import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateSeason, SEASON, type SeasonCounts } from '../../db/season';
import { documentProblems } from '../../src/engine';
import type { BuildDocument } from '../../src/engine/types';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { memoryStorage } from '../helpers/fixtures';

/**
 * The season generator (benchmark data) at a tenth of a season: its counts scale, every revision
 * and plan is a build the app accepts, every run carries the revision in force at its time, each
 * logged run has its samples, summary and stored file, and two teams stay apart.
 */
describe('the season generator', () => {
	let t: TestDb;
	let a: SeasonCounts;
	let b: SeasonCounts;
	const storage = memoryStorage();
	beforeAll(async () => {
		t = await createTestDb();
		a = await generateSeason(t.db, { scale: 0.1, index: 1, storage });
		b = await generateSeason(t.db, { scale: 0.1, index: 2 });
	}, 120_000);
	afterAll(async () => t?.drop());

	it('makes a tenth of each count', () => {
		expect(a).toMatchObject({
			vehicles: Math.round(SEASON.vehicles / 10),
			events: SEASON.events / 10,
			runs: SEASON.runs / 10,
			plans: SEASON.plans / 10,
		});
		expect(a.revisions).toBe(a.vehicles * Math.round(SEASON.revisionsPerVehicle / 10));
		expect(a.loggerRuns).toBe(Math.ceil(a.runs / 3));
	});

	it('writes only builds the app accepts', async () => {
		const docs = [
			...(await t.db
				.selectFrom('revision as r')
				.innerJoin('build as b', 'b.id', 'r.build_id')
				.innerJoin('vehicle as v', 'v.id', 'b.vehicle_id')
				.select('r.document')
				.where('v.team_id', '=', a.teamId)
				.execute()),
			...(await t.db
				.selectFrom('plan as p')
				.innerJoin('vehicle as v', 'v.id', 'p.vehicle_id')
				.select('p.document')
				.where('v.team_id', '=', a.teamId)
				.execute()),
		];
		expect(docs.length).toBe(a.revisions + a.plans);
		for (const d of docs) expect(documentProblems(d.document as BuildDocument)).toEqual([]);
	});

	it('links every run to the revision in force at its time', async () => {
		const runs = await t.db
			.selectFrom('run as r')
			.innerJoin('vehicle as v', 'v.id', 'r.vehicle_id')
			.innerJoin('build as b', 'b.vehicle_id', 'v.id')
			.select(['r.ran_at', 'r.revision_id', 'b.id as build_id'])
			.where('v.team_id', '=', a.teamId)
			.execute();
		expect(runs).toHaveLength(a.runs);
		for (const r of runs.slice(0, 40)) {
			const inForce = await t.db
				.selectFrom('revision')
				.select('id')
				.where('build_id', '=', r.build_id)
				.where('created_at', '<=', r.ran_at)
				.orderBy('created_at', 'desc')
				.limit(1)
				.executeTakeFirst();
			expect(r.revision_id).toBe(inForce?.id ?? null);
		}
	});

	it('gives each logged run its samples, its summary and its file; the teams stay apart', async () => {
		const logged = await t.db
			.selectFrom('run as r')
			.innerJoin('vehicle as v', 'v.id', 'r.vehicle_id')
			.select(['r.id', 'r.logger_min_v', 'r.logger_resting_v', 'v.team_id'])
			.select((eb) =>
				eb
					.selectFrom('run_sample as s')
					.whereRef('s.run_id', '=', 'r.id')
					.select(eb.fn.countAll<number>().as('n'))
					.as('samples'),
			)
			.where('r.logger_min_v', 'is not', null)
			.execute();
		const mine = logged.filter((r) => r.team_id === a.teamId);
		expect(mine).toHaveLength(a.loggerRuns);
		expect(mine.reduce((n, r) => n + Number(r.samples), 0)).toBe(a.samples);
		for (const r of mine) expect(r.logger_min_v!).toBeLessThan(r.logger_resting_v!);
		expect(storage.objects.size).toBe(a.loggerRuns);
		expect([...storage.objects.keys()].every((k) => k.startsWith(`teams/${a.teamId}/`))).toBe(true);
		expect(logged.filter((r) => r.team_id === b.teamId)).toHaveLength(b.loggerRuns);
	});
});
