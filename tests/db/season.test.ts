import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_BUILDS } from '../../db/demo/builds';
import { DEMO_EVENTS, DEMO_RUNS } from '../../db/demo/runs';
import { DEMO_USERS, seedDemo } from '../../db/seed';
import { buildReport, headlineFigures } from '../../src/engine';
import { upsertSignoff } from '../../src/lib/server/db/checklists';
import { findRuns, insertRun } from '../../src/lib/server/db/runs';
import { loadChecklist } from '../../src/lib/server/checklist';
import { loadSeason } from '../../src/lib/server/season';
import { createTestDb, type TestDb } from '../helpers/test-db';

describe('the team page’s season at a glance', () => {
	let t: TestDb;
	let teamId: string;
	const today = '2026-12-03';
	beforeAll(async () => {
		t = await createTestDb();
		teamId = await seedDemo(t.db);
	});
	afterAll(async () => t?.drop());

	it('gives each vehicle its head revision’s figures, its last run and its checks for the next event', async () => {
		const season = await loadSeason(t.db, teamId, 'metric', today);
		expect(season.nextEvent?.name).toBe(DEMO_EVENTS.find((e) => e.on > today)!.name);
		expect(season.vehicles.map((v) => v.name)).toEqual(['Marlin', 'Old Oak', 'Pebble']);
		for (const v of season.vehicles) {
			// The figures are the engine's own for the head document (the last of each demo history).
			const report = buildReport(
				DEMO_BUILDS[v.name as keyof typeof DEMO_BUILDS],
				{ fuseDistanceM: 0.45 },
				{ burpRun: false },
			);
			if (!report.ok) throw new Error('demo build does not solve');
			expect(v.head?.figures).toEqual(headlineFigures(report));
			const runs = DEMO_RUNS.filter((r) => r.vehicle === v.name).sort((a, b) =>
				a.on.localeCompare(b.on),
			);
			expect(v.lastRun?.scoreDb).toBe(runs.at(-1)!.scoreDb);
			expect(v.lastRun?.ranAt.toISOString().slice(0, 10)).toBe(runs.at(-1)!.on);
			expect(v.nextChecks?.total).toBeGreaterThan(2);
			// The counts are those of the checklist the event's checks page shows for the vehicle.
			const list = await loadChecklist(t.db, teamId, season.nextEvent!.id, v.id, 'metric');
			expect(v.nextChecks).toEqual({
				outstanding: list!.items.filter((x) => x.outstanding).length,
				total: list!.items.length,
			});
		}
		// Marlin's feeds run past the drop target and nobody has signed the manual items yet.
		expect(season.vehicles[0]!.nextChecks!.outstanding).toBeGreaterThanOrEqual(3);
		expect(season.scores).toHaveLength(DEMO_RUNS.filter((r) => r.scoreDb !== null).length);
		expect(season.scores.map((s) => s.ranAt)).toEqual(season.scores.map((s) => s.ranAt).sort());
	});

	it('lists the team’s activity newest first with who did what: revisions, runs and waivers', async () => {
		const before = await loadSeason(t.db, teamId, 'metric', today);
		const kinds = new Set(before.activity.map((a) => a.kind));
		expect(kinds.has('revision')).toBe(true);
		const times = before.activity.map((a) => a.at.getTime());
		expect(times).toEqual([...times].sort((a, b) => b - a));

		const member = await t.db
			.selectFrom('User')
			.select(['id', 'name'])
			.where('email', '=', DEMO_USERS[1].email)
			.executeTakeFirstOrThrow();
		const captain = await t.db
			.selectFrom('User')
			.select('id')
			.where('email', '=', DEMO_USERS[0].email)
			.executeTakeFirstOrThrow();
		const marlin = before.vehicles[0]!;
		await insertRun(t.db, {
			vehicleId: marlin.id,
			eventId: null,
			revisionId: null,
			ranAt: '2026-12-03T10:00:00Z',
			ranAtOffsetMin: 0,
			scoreDb: 149.1,
			frequencyHz: null,
			restingV: null,
			minV: 11.95,
			ambientC: null,
			authorId: member.id,
		});
		await upsertSignoff(t.db, {
			eventId: before.nextEvent!.id,
			vehicleId: marlin.id,
			itemKey: 'drops',
			signedBy: captain.id,
			note: 'Feed upsized before the event',
			waived: true,
		});
		const after = await loadSeason(t.db, teamId, 'metric', today);
		expect(after.activity.slice(0, 2).map((a) => `${a.who} ${a.text} · ${a.vehicleName}`)).toEqual([
			'Demo Captain waived “voltage drops” for Winter Open · Marlin',
			'Demo Member logged a run: 149.1 dB at 11.95 V · Marlin',
		]);
		expect(after.vehicles[0]!.lastRun?.scoreDb).toBe(149.1);
		// A run with a logger file reads the logger's minimum in the activity and on the card, as
		// everywhere else (the demo's Marlin finals run: typed 11.7 V).
		const finals = after.activity.find(
			(a) => a.kind === 'run' && a.vehicleName === 'Marlin' && /Season Finals/.test(a.text),
		)!;
		const logged = (await findRuns(t.db, teamId, { vehicleId: marlin.id })).find(
			(r) => r.eventName === 'Season Finals',
		)!;
		expect(logged.logger).not.toBeNull();
		expect(finals.text).toContain(`at ${logged.logger!.minV.toFixed(2)} V`);
		expect(finals.text).not.toContain('at 11.70 V');
		expect(after.vehicles[0]!.nextChecks!.outstanding).toBe(
			before.vehicles[0]!.nextChecks!.outstanding - 1,
		);
	});
});
