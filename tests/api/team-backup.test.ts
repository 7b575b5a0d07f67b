import { createHash } from 'node:crypto';
import type { Kysely } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Database } from '../../src/lib/server/db/schema';
import { DEMO_USERS, seedDemo } from '../../db/seed';
import { DEMO_SEASON, DEMO_SHELF } from '../../db/demo/shelf';
import { DEMO_COMMENTS } from '../../db/demo/comments';
import type { AppUser } from '../../src/lib/server/auth';
import { appendRevision, findHeadRevision } from '../../src/lib/server/db/builds';
import type { Storage } from '../../src/lib/server/storage';
import { makeThumbnail } from '../../src/lib/server/file-content';
import * as exportRoute from '../../src/pages/api/teams/[teamId]/export';
import * as importRoute from '../../src/pages/api/teams/import';
import { callEndpoint, jsonRequest } from '../helpers/container';
import { localsFor, makeUser, memoryStorage } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

type Row = Record<string, unknown>;

/**
 * Everything stored for a team, read straight from the tables (not through the export code):
 * every column of every team table, with database ids replaced by what they point at (a vehicle's
 * name, a revision's vehicle and number, a user's e-mail…) and each file's bytes as a SHA-256.
 * Two teams with equal snapshots hold the same data.
 */
async function snapshot(db: Kysely<Database>, storage: Storage, teamId: string) {
	const users = new Map(
		(await db.selectFrom('User').select(['id', 'email']).execute()).map((u) => [u.id, u.email]),
	);
	const user = (id: unknown) => (id ? (users.get(id as string) ?? `unknown user`) : null);
	// A person as the team records them: a live account here, or the address a restored backup recorded.
	const person = (id: unknown, importedBy: string | null) => user(id) ?? importedBy;
	const team = await db
		.selectFrom('team')
		.selectAll()
		.where('id', '=', teamId)
		.executeTakeFirstOrThrow();
	const vehicles = await db
		.selectFrom('vehicle')
		.selectAll()
		.where('team_id', '=', teamId)
		.execute();
	const vName = new Map(vehicles.map((v) => [v.id, v.name]));
	const vIds = vehicles.map((v) => v.id);
	const builds = await db.selectFrom('build').selectAll().where('vehicle_id', 'in', vIds).execute();
	const buildVehicle = new Map(builds.map((b) => [b.id, vName.get(b.vehicle_id)!]));
	const revisions = await db
		.selectFrom('revision')
		.selectAll()
		.where(
			'build_id',
			'in',
			builds.map((b) => b.id),
		)
		.execute();
	const rName = new Map(
		revisions.map((r) => [r.id, `${buildVehicle.get(r.build_id)}#${r.number}`]),
	);
	const rev = (id: unknown) => (id ? rName.get(id as string)! : null);
	const events = await db.selectFrom('event').selectAll().where('team_id', '=', teamId).execute();
	const eName = new Map(events.map((e) => [e.id, `${e.name}@${e.starts_on}`]));
	const runs = await db.selectFrom('run').selectAll().where('vehicle_id', 'in', vIds).execute();
	const runName = new Map(
		runs.map((r) => [r.id, `${vName.get(r.vehicle_id)}@${r.ran_at.toISOString()}`]),
	);
	const plans = await db.selectFrom('plan').selectAll().where('vehicle_id', 'in', vIds).execute();
	const pName = new Map(plans.map((p) => [p.id, `${vName.get(p.vehicle_id)}/${p.name}`]));
	const items = await db
		.selectFrom('check_item')
		.selectAll()
		.where('team_id', '=', teamId)
		.execute();
	const itemName = new Map(items.map((i) => [`manual:${i.id}`, `manual:${i.label}`]));
	const files = await db
		.selectFrom('stored_file')
		.selectAll()
		.where('team_id', '=', teamId)
		.execute();
	const sorted = (rows: Row[]) => rows.map((r) => JSON.stringify(r)).sort();
	const fileRows = [];
	const purchaseName = new Map(
		(
			await db
				.selectFrom('purchase as p')
				.innerJoin('season as se', 'se.id', 'p.season_id')
				.select(['p.id', 'p.item', 'p.bought_on', 'se.name'])
				.where('se.team_id', '=', teamId)
				.execute()
		).map((p) => [p.id, `${p.name}/${p.bought_on}/${p.item}`]),
	);
	for (const { id, team_id, run_id, purchase_id, object_key, ...f } of files) {
		const bytes = await storage.get(object_key);
		// Object names are made by the server on import; what must survive is the kind and the photo-thumbnail pairing.
		fileRows.push({
			...f,
			run: run_id ? runName.get(run_id) : null,
			purchase: purchase_id ? purchaseName.get(purchase_id) : null,
			object: object_key
				.slice(object_key.lastIndexOf('/') + 1)
				.replace(/^(photo|logger|receipt)-[^.]+?(-thumb)?\./, '$1$2.'),
			sha256: bytes ? createHash('sha256').update(bytes).digest('hex') : 'missing',
		});
	}
	// The data version counts the writes that made the team, not what it holds.
	const { id, name, last_digest_at, data_version, ...teamRest } = team;
	return {
		team: teamRest,
		// Members and invitations together: a restored team invites everyone but its importer.
		people: sorted([
			...(
				await db.selectFrom('membership').selectAll().where('team_id', '=', teamId).execute()
			).map(({ user_id, role }) => ({ email: user(user_id), role })),
			...(
				await db
					.selectFrom('invitation')
					.selectAll()
					.where('team_id', '=', teamId)
					.where('accepted_at', 'is', null)
					.where('revoked_at', 'is', null)
					.execute()
			).map(({ email, role }) => ({ email, role })),
		]),
		vehicles: sorted(
			vehicles.map(({ id, team_id, owner_id, imported_by, ...v }) => ({
				...v,
				owner: person(owner_id, imported_by),
			})),
		),
		builds: sorted(
			builds.map((b) => ({
				vehicle: vName.get(b.vehicle_id),
				head: rev(b.head_revision_id),
				created: typeof b.created_at,
			})),
		),
		revisions: sorted(
			revisions.map(
				({ id, build_id, parent_id, restored_from_id, author_id, imported_by, ...r }) => ({
					...r,
					vehicle: buildVehicle.get(build_id),
					parent: rev(parent_id),
					restoredFrom: rev(restored_from_id),
					author: person(author_id, imported_by),
				}),
			),
		),
		plans: sorted(
			plans.map(
				({
					id,
					vehicle_id,
					base_revision_id,
					installed_revision_id,
					created_by,
					imported_by,
					...p
				}) => ({
					...p,
					vehicle: vName.get(vehicle_id),
					base: rev(base_revision_id),
					installed: rev(installed_revision_id),
					by: person(created_by, imported_by),
				}),
			),
		),
		seasons: sorted(
			await Promise.all(
				(await db.selectFrom('season').selectAll().where('team_id', '=', teamId).execute()).map(
					async ({ id, team_id, ...x }) => ({
						...x,
						purchases: (
							await db
								.selectFrom('purchase as p')
								.leftJoin('shelf_item as s', 's.id', 'p.shelf_item_id')
								.selectAll('p')
								.select('s.label as shelf_label')
								.where('p.season_id', '=', id)
								.orderBy('p.bought_on')
								.orderBy('p.item')
								.execute()
						).map(
							({ id: _id, season_id, shelf_item_id, paid_by, imported_by, created_by, ...p }) => ({
								...p,
								paidBy: person(paid_by, imported_by),
							}),
						),
					}),
				),
			),
		),
		comments: sorted(
			(await db.selectFrom('comment').selectAll().where('team_id', '=', teamId).execute()).map(
				({
					id,
					team_id,
					revision_id,
					run_id,
					plan_id,
					event_id,
					author_id,
					imported_by,
					...c
				}) => ({
					...c,
					on: revision_id
						? `revision ${rev(revision_id)}`
						: plan_id
							? `plan ${pName.get(plan_id)}`
							: run_id
								? `run ${runName.get(run_id)}`
								: `event ${eName.get(event_id!)}`,
					author: person(author_id, imported_by),
				}),
			),
		),
		shelf: sorted(
			(await db.selectFrom('shelf_item').selectAll().where('team_id', '=', teamId).execute()).map(
				({ id, team_id, ...x }) => x,
			),
		),
		parts: sorted(
			(
				await db
					.selectFrom('plan_part')
					.selectAll()
					.where(
						'plan_id',
						'in',
						plans.length ? plans.map((p) => p.id) : ['00000000-0000-0000-0000-000000000000'],
					)
					.execute()
			).map(({ plan_id, ...x }) => ({ ...x, plan: pName.get(plan_id) })),
		),
		events: sorted(events.map(({ id, team_id, ...e }) => e)),
		runs: sorted(
			runs.map(({ id, vehicle_id, event_id, revision_id, author_id, imported_by, ...r }) => ({
				...r,
				vehicle: vName.get(vehicle_id),
				event: event_id ? eName.get(event_id) : null,
				revision: rev(revision_id),
				author: person(author_id, imported_by),
			})),
		),
		samples: sorted(
			(
				await db
					.selectFrom('run_sample')
					.selectAll()
					.where(
						'run_id',
						'in',
						runs.map((r) => r.id),
					)
					.execute()
			).map(({ run_id, ...s }) => ({ ...s, run: runName.get(run_id) })),
		),
		files: sorted(fileRows),
		items: sorted(items.map(({ id, team_id, ...i }) => i)),
		signoffs: sorted(
			(
				await db.selectFrom('check_signoff').selectAll().where('vehicle_id', 'in', vIds).execute()
			).map(({ event_id, vehicle_id, item_key, signed_by, imported_by, revision_id, ...s }) => ({
				...s,
				revision: rev(revision_id),
				event: eName.get(event_id),
				vehicle: vName.get(vehicle_id),
				item: itemName.get(item_key) ?? item_key,
				by: person(signed_by, imported_by),
			})),
		),
	};
}

let THUMB: Uint8Array;
const PNG = Buffer.from(
	'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
	'base64',
);

describe('team backup', () => {
	let t: TestDb;
	const storage = memoryStorage();
	let teamId: string;
	let captain: AppUser;
	let viewer: AppUser;
	let backupText: string;

	beforeAll(async () => {
		t = await createTestDb();
		THUMB = await makeThumbnail(new Uint8Array(PNG));
		teamId = await seedDemo(t.db, storage);
		const byEmail = async (email: string) => {
			const u = await t.db
				.selectFrom('User')
				.select(['id', 'email', 'name'])
				.where('email', '=', email)
				.executeTakeFirstOrThrow();
			return { id: u.id, email: u.email!, name: u.name } as AppUser;
		};
		captain = await byEmail(DEMO_USERS[0].email);
		viewer = await byEmail(DEMO_USERS[2].email);
		// Beyond the demo: a restored revision, an installed plan, a photo with its thumbnail,
		// sign-offs of a computed and a manual item, and an archived vehicle.
		const oak = await t.db
			.selectFrom('vehicle as v')
			.innerJoin('build as b', 'b.vehicle_id', 'v.id')
			.select(['v.id', 'b.id as build_id'])
			.where('v.team_id', '=', teamId)
			.where('v.name', '=', 'Old Oak')
			.executeTakeFirstOrThrow();
		const head = (await findHeadRevision(t.db, oak.build_id))!;
		const first = await t.db
			.selectFrom('revision')
			.select('id')
			.where('build_id', '=', oak.build_id)
			.where('number', '=', 1)
			.executeTakeFirstOrThrow();
		const restored = await appendRevision(t.db, {
			buildId: oak.build_id,
			parentId: head.id,
			document: head.document,
			message: 'Back to the start',
			authorId: captain.id,
			restoredFromId: first.id,
		});
		if (!restored.ok) throw new Error('restore');
		await t.db
			.updateTable('plan')
			.set({
				installed_revision_id: restored.revision.id,
				installed_at: new Date('2026-11-20T10:00:00Z'),
			})
			.where('vehicle_id', '=', oak.id)
			.where('name', 'like', 'Third%')
			.execute();
		const run = await t.db
			.selectFrom('run')
			.select('id')
			.where('vehicle_id', '=', oak.id)
			.executeTakeFirstOrThrow();
		const base = `teams/${teamId}/runs/${run.id}/photo-1`;
		await storage.put(`${base}.png`, new Uint8Array(PNG), 'image/png');
		await storage.put(`${base}-thumb.webp`, THUMB, 'image/webp');
		await t.db
			.insertInto('stored_file')
			.values([
				{
					team_id: teamId,
					run_id: run.id,
					kind: 'photo',
					object_key: `${base}.png`,
					file_name: 'lanes.png',
					content_type: 'image/png',
					size_bytes: PNG.byteLength,
				},
				{
					team_id: teamId,
					run_id: run.id,
					kind: 'thumbnail',
					object_key: `${base}-thumb.webp`,
					file_name: 'lanes.png (thumbnail)',
					content_type: 'image/webp',
					size_bytes: THUMB.byteLength,
				},
			])
			.execute();
		const event = await t.db
			.selectFrom('event')
			.select('id')
			.where('team_id', '=', teamId)
			.orderBy('starts_on', 'desc')
			.executeTakeFirstOrThrow();
		const item = await t.db
			.selectFrom('check_item')
			.select('id')
			.where('team_id', '=', teamId)
			.executeTakeFirstOrThrow();
		await t.db
			.insertInto('check_signoff')
			.values([
				{
					event_id: event.id,
					vehicle_id: oak.id,
					item_key: 'battery_fusing',
					signed_by: captain.id,
					note: 'Checked at the table',
				},
				{
					event_id: event.id,
					vehicle_id: oak.id,
					item_key: `manual:${item.id}`,
					signed_by: viewer.id,
				},
				{
					// A waiver scoped to the revision it was given on, with what it accepted.
					event_id: event.id,
					vehicle_id: oak.id,
					item_key: 'drops',
					signed_by: captain.id,
					note: 'Accepted for this event only',
					waived: true,
					revision_id: (
						await t.db
							.selectFrom('build')
							.select('head_revision_id')
							.where('id', '=', oak.build_id)
							.executeTakeFirstOrThrow()
					).head_revision_id,
					waived_value: 0.61,
					waived_reasons: JSON.stringify(['"Rear feed" drops 0.61 V under burp']),
				},
			])
			.execute();
		// A receipt photo on the demo season's first purchase.
		const bought = await t.db
			.selectFrom('purchase as p')
			.innerJoin('season as se', 'se.id', 'p.season_id')
			.select('p.id')
			.where('se.team_id', '=', teamId)
			.orderBy('p.bought_on')
			.executeTakeFirstOrThrow();
		const receiptKey = `teams/${teamId}/receipts/${bought.id}/receipt-1.png`;
		await storage.put(receiptKey, new Uint8Array(PNG), 'image/png');
		await t.db
			.insertInto('stored_file')
			.values({
				team_id: teamId,
				purchase_id: bought.id,
				kind: 'receipt',
				object_key: receiptKey,
				file_name: 'till slip.png',
				content_type: 'image/png',
				size_bytes: PNG.byteLength,
			})
			.execute();
		// A setting away from its default, and a comment changed after it was written.
		await t.db
			.updateTable('team')
			.set({ viewers_may_comment: true })
			.where('id', '=', teamId)
			.execute();
		await t.db
			.updateTable('comment')
			.set({ edited_at: new Date('2026-10-21T08:00:00Z') })
			.where('team_id', '=', teamId)
			.where('event_id', 'is not', null)
			.execute();
		await t.db
			.updateTable('vehicle')
			.set({ archived_at: new Date('2026-10-01T00:00:00Z') })
			.where('team_id', '=', teamId)
			.where('name', '=', 'Pebble')
			.execute();

		const res = await callEndpoint(exportRoute, {
			locals: localsFor(t.db, viewer, undefined, storage),
			params: { teamId },
			request: jsonRequest('/x', 'GET'),
		});
		expect(res.status).toBe(200);
		expect(res.headers.get('content-disposition')).toMatch(
			/attachment; filename="sagwise-harbour-street-sag-club-\d{4}-\d{2}-\d{2}\.json"/,
		);
		backupText = await res.text();
	});
	afterAll(async () => t?.drop());

	const upload = (text: string, user: AppUser, name?: string, store: Storage = storage) => {
		const form = new FormData();
		form.set('file', new Blob([text], { type: 'application/json' }), 'backup.json');
		if (name) form.set('name', name);
		return callEndpoint(importRoute, {
			locals: localsFor(t.db, user, undefined, store),
			request: new Request('http://localhost/api/teams/import', { method: 'POST', body: form }),
		});
	};
	const counts = async () => ({
		teams: Number(
			(
				await t.db
					.selectFrom('team')
					.select((e) => e.fn.countAll().as('n'))
					.executeTakeFirstOrThrow()
			).n,
		),
		revisions: Number(
			(
				await t.db
					.selectFrom('revision')
					.select((e) => e.fn.countAll().as('n'))
					.executeTakeFirstOrThrow()
			).n,
		),
		objects: storage.objects.size,
	});

	it('imports into a new team with every table and file equal to the original', async () => {
		const res = await upload(backupText, captain, 'Harbour Street (restored)');
		expect(res.status).toBe(201);
		const summary = await res.json();
		expect(summary).toMatchObject({
			name: 'Harbour Street (restored)',
			members: 1,
			invitations: 2,
			vehicles: 3,
			plans: 2,
		});
		const before = await snapshot(t.db, storage, teamId);
		const after = await snapshot(t.db, storage, summary.teamId);
		expect(after).toEqual(before);
		// Not vacuous: the snapshot holds the demo's content, files and sign-offs.
		expect(before.revisions.length).toBe(10);
		expect(before.files.length).toBeGreaterThanOrEqual(6);
		expect(before.files.join()).toContain('"kind":"thumbnail"');
		expect(before.files.join()).toContain('"kind":"receipt"');
		expect(before.signoffs.length).toBe(3);
		expect(before.parts.length).toBe(10);
		expect(before.shelf.length).toBe(DEMO_SHELF.length);
		expect(before.comments.length).toBe(DEMO_COMMENTS.length);
		for (const on of ['revision Marlin#', 'plan Old Oak/', 'run Old Oak@', 'event '])
			expect(before.comments.join()).toContain(`"on":"${on}`);
		expect(before.seasons.join()).toContain('"shelf_label":"100 Ah AGM, rear spare"');
		expect(before.seasons.join().match(/"bought_on"/g)).toHaveLength(DEMO_SEASON.purchases.length);
	});

	it('imports on another installation: unknown members are invited, the importer is captain', async () => {
		const other = await createTestDb();
		try {
			const otherStorage = memoryStorage();
			const importer = await makeUser(other.db, 'newcomer@sagwise.test', 'Newcomer');
			const form = new FormData();
			form.set('file', new Blob([backupText]), 'backup.json');
			const res = await callEndpoint(importRoute, {
				locals: localsFor(other.db, importer, undefined, otherStorage),
				request: new Request('http://localhost/api/teams/import', { method: 'POST', body: form }),
			});
			expect(res.status).toBe(201);
			const summary = await res.json();
			expect(summary).toMatchObject({
				members: 1,
				invitations: 3,
				revisions: 10,
				files: expect.any(Number),
			});
			const invited = await other.db
				.selectFrom('invitation')
				.select(['email', 'role'])
				.where('team_id', '=', summary.teamId)
				.orderBy('email')
				.execute();
			expect(invited).toEqual(
				DEMO_USERS.map((u) => ({ email: u.email, role: u.role })).sort((a, b) =>
					a.email.localeCompare(b.email),
				),
			);
			expect(otherStorage.objects.size).toBe(summary.files);
		} finally {
			await other.drop();
		}
	});

	it('refuses a file cut short, an edited file and a file of a newer version, writing nothing', async () => {
		const start = await counts();
		const cut = await upload(backupText.slice(0, backupText.length / 2), captain);
		expect(cut.status).toBe(400);
		expect(await cut.json()).toMatchObject({
			code: 'invalid_backup',
			detail: expect.stringMatching(/not valid JSON/),
		});

		const edited = JSON.parse(backupText);
		edited.team.runs[0].scoreDb = 199.9;
		const tampered = await upload(JSON.stringify(edited), captain);
		expect(tampered.status).toBe(400);
		expect((await tampered.json()).detail).toMatch(/checksum does not match/);

		const newer = { ...JSON.parse(backupText), version: 2 };
		const future = await upload(JSON.stringify(newer), captain);
		expect(future.status).toBe(422);
		expect(await future.json()).toMatchObject({
			code: 'unsupported_version',
			detail: expect.stringMatching(/newer version/),
		});

		const notOurs = await upload(JSON.stringify({ hello: 'world' }), captain);
		expect(notOurs.status).toBe(400);
		const asJson = await callEndpoint(importRoute, {
			locals: localsFor(t.db, captain, undefined, storage),
			request: jsonRequest('/x', 'POST', JSON.parse(backupText)),
		});
		expect(asJson.status).toBe(415);
		const noFile = await callEndpoint(importRoute, {
			locals: localsFor(t.db, captain, undefined, storage),
			request: new Request('http://localhost/x', { method: 'POST', body: new FormData() }),
		});
		expect(noFile.status).toBe(400);
		expect((await noFile.json()).errors).toEqual([{ path: 'file', message: 'No file' }]);
		expect(await counts()).toEqual(start);
	});

	it('removes the files it stored when the import fails part-way', async () => {
		const start = await counts();
		let puts = 0;
		const failing: Storage = {
			put: async (key, body, type) => {
				if (++puts === 3) throw new Error('storage unavailable');
				await storage.put(key, body, type);
			},
			get: storage.get,
			remove: storage.remove,
			list: storage.list,
			ping: storage.ping,
		};
		const res = await upload(backupText, captain, 'Half', failing);
		expect(res.status).toBe(500);
		expect((await res.json()).detail).toMatch(/nothing of it was kept/);
		expect(await counts()).toEqual(start);
	});
});
