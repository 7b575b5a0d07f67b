import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import { revisionInForceAt } from '../../src/lib/schemas/runs';
import { appendRevision, listRevisions, revisionInForce } from '../../src/lib/server/db/builds';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import { makeTeam, makeUser } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

describe('the revision in force: one rule for the run form and the server', () => {
	let t: TestDb;
	let vehicleId: string;
	let buildId: string;
	beforeAll(async () => {
		t = await createTestDb();
		const teamId = await makeTeam(t.db, 'Same Second Team');
		const v = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Quick saver',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		vehicleId = v.vehicle.id;
		buildId = v.buildId;
		const author = await makeUser(t.db, 'quick@sagwise.test', 'Quick');
		let parentId: string | null = null;
		for (const message of ['one', 'two', 'three']) {
			const saved = await appendRevision(t.db, {
				buildId,
				parentId,
				document: pebbleBuild,
				message,
				authorId: author.id,
			});
			if (!saved.ok) throw new Error('save refused');
			parentId = saved.revision.id;
		}
		// All three in the same second (microseconds apart, as quick saves are).
		// Revisions are immutable (a trigger refuses updates); this throwaway database sets the
		// times the way three quick saves would have made them.
		await sql`alter table revision disable trigger user`.execute(t.db);
		await t.db
			.updateTable('revision')
			.set({
				created_at: sql<Date>`'2026-06-01T10:00:30Z'::timestamptz + number * interval '1 microsecond'`,
			})
			.where('build_id', '=', buildId)
			.execute();
		await sql`alter table revision enable trigger user`.execute(t.db);
	});
	afterAll(async () => t?.drop());

	it('ties a run made in that second to the newest of them, in the browser and on the server', async () => {
		const at = new Date('2026-06-01T10:00:30.000Z');
		const server = await revisionInForce(t.db, vehicleId, at);
		const list = await listRevisions(t.db, buildId);
		const browser = revisionInForceAt(list, at);
		const newest = list.reduce((a, b) => (b.number > a.number ? b : a));
		expect(server).toBe(newest.id);
		expect(browser?.id).toBe(newest.id);
		// The order the list arrives in does not matter.
		expect(revisionInForceAt([...list].reverse(), at)?.id).toBe(newest.id);
		// A second earlier, none was in force yet.
		expect(revisionInForceAt(list, new Date('2026-06-01T10:00:29.000Z'))).toBeNull();
		expect(await revisionInForce(t.db, vehicleId, new Date('2026-06-01T10:00:29.000Z'))).toBeNull();
	});
});
