import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_EVENTS } from '../../db/demo/runs';
import { DEMO_USERS, seedDemo } from '../../db/seed';
import { upsertSignoff } from '../../src/lib/server/db/checklists';
import { appendRevision, findHeadRevision } from '../../src/lib/server/db/builds';
import { insertEvent } from '../../src/lib/server/db/events';
import { insertRun } from '../../src/lib/server/db/runs';
import { findMembership, renameTeam } from '../../src/lib/server/db/teams';
import { updateVehicle } from '../../src/lib/server/db/vehicles';
import { loadSeasonCached } from '../../src/lib/server/season';
import { createTestDb, type TestDb } from '../helpers/test-db';

describe('a team’s data version, behind the team page’s cache', () => {
	let t: TestDb;
	let teamId: string;
	let captainId: string;
	const today = '2026-12-03';
	beforeAll(async () => {
		t = await createTestDb();
		teamId = await seedDemo(t.db);
		captainId = (
			await t.db
				.selectFrom('User')
				.select('id')
				.where('email', '=', DEMO_USERS[0].email)
				.executeTakeFirstOrThrow()
		).id;
	});
	afterAll(async () => t?.drop());

	const access = async () => {
		const m = await findMembership(t.db, teamId, captainId);
		return { teamId, dataVersion: m!.data_version };
	};
	const vehicle = (name: string) =>
		t.db
			.selectFrom('vehicle as v')
			.innerJoin('build as b', 'b.vehicle_id', 'v.id')
			.select(['v.id', 'b.id as build_id'])
			.where('v.team_id', '=', teamId)
			.where('v.name', '=', name)
			.executeTakeFirstOrThrow();

	it('moves with every kind of change the team page shows, and only once a commit', async () => {
		const marlin = await vehicle('Marlin');
		const changes: Array<[string, () => Promise<unknown>]> = [
			['a vehicle renamed', () => updateVehicle(t.db, marlin.id, { description: 'Night build' })],
			['the team renamed', () => renameTeam(t.db, teamId, 'Harbour Street Audio Works')],
			[
				'a revision saved',
				async () => {
					const head = await findHeadRevision(t.db, marlin.build_id);
					const saved = await appendRevision(t.db, {
						buildId: marlin.build_id,
						parentId: head!.id,
						document: head!.document,
						message: 'Same parts, new note',
						authorId: captainId,
					});
					expect(saved.ok).toBe(true);
				},
			],
			[
				'a run logged',
				() =>
					insertRun(t.db, {
						vehicleId: marlin.id,
						eventId: null,
						revisionId: null,
						ranAt: '2026-12-02T10:00:00Z',
						ranAtOffsetMin: 0,
						scoreDb: 147.2,
						frequencyHz: null,
						restingV: null,
						minV: 12.1,
						ambientC: null,
						authorId: captainId,
					}),
			],
			[
				'an event added',
				() =>
					insertEvent(t.db, teamId, {
						name: 'Quay Night',
						place: 'Quay car park',
						format: 'Open lanes',
						startsOn: '2027-01-09',
						endsOn: '2027-01-09',
						notes: '',
					}),
			],
			[
				'a check signed off',
				async () => {
					const event = await t.db
						.selectFrom('event')
						.select('id')
						.where('team_id', '=', teamId)
						.where('name', '=', DEMO_EVENTS.find((e) => e.on > today)!.name)
						.executeTakeFirstOrThrow();
					await upsertSignoff(t.db, {
						eventId: event.id,
						vehicleId: marlin.id,
						itemKey: 'drops',
						signedBy: captainId,
						note: 'Checked at the bench',
						waived: true,
					});
				},
			],
			[
				'a comment written (the activity lists it)',
				async () => {
					const event = await t.db
						.selectFrom('event')
						.select('id')
						.where('team_id', '=', teamId)
						.executeTakeFirstOrThrow();
					await t.db
						.insertInto('comment')
						.values({
							team_id: teamId,
							event_id: event.id,
							author_id: captainId,
							body: 'Bring the clamp meter',
						})
						.execute();
				},
			],
			[
				'a member renamed',
				() =>
					t.db
						.updateTable('User')
						.set({ name: 'Captain D.' })
						.where('id', '=', captainId)
						.execute(),
			],
		];
		for (const [what, change] of changes) {
			const before = BigInt((await access()).dataVersion);
			await change();
			const after = BigInt((await access()).dataVersion);
			// Exactly one: a revision save writes a revision and its build in one transaction.
			expect(after - before, what).toBe(1n);
		}

		// Reading changes nothing; a write that rolls back changes nothing; a write elsewhere neither.
		const still = (await access()).dataVersion;
		await loadSeasonCached(t.db, await access(), 'metric', today);
		await t.db
			.transaction()
			.execute(async (trx) => {
				await trx
					.updateTable('vehicle')
					.set({ name: 'Never kept' })
					.where('id', '=', marlin.id)
					.execute();
				throw new Error('rolled back');
			})
			.catch(() => undefined);
		await t.db
			.updateTable('User')
			.set({ image: 'https://avatars.invalid/captain.png' })
			.where('id', '=', captainId)
			.execute();
		expect((await access()).dataVersion).toBe(still);
	});

	it('serves the same season until the version moves, then the change', async () => {
		const first = await loadSeasonCached(t.db, await access(), 'metric', today);
		expect(await loadSeasonCached(t.db, await access(), 'metric', today)).toBe(first);
		const pebble = await vehicle('Pebble');
		await updateVehicle(t.db, pebble.id, { name: 'Pebble II' });
		const next = await loadSeasonCached(t.db, await access(), 'metric', today);
		expect(next).not.toBe(first);
		expect(next.vehicles.map((v) => v.name)).toContain('Pebble II');
		expect(first.vehicles.map((v) => v.name)).not.toContain('Pebble II');
	});
});
