import { createHash } from 'node:crypto';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import type { AppUser } from '../../src/lib/server/auth';
import { appendRevision } from '../../src/lib/server/db/builds';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import { exportTeam, parseBackup, readBackup } from '../../src/lib/server/team-backup';
import * as importRoute from '../../src/pages/api/teams/import';
import { callEndpoint } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser, memoryStorage } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

/** A backup file is anyone's to edit: these are edited files with a correct checksum. */
const resign = (backup: { team: unknown; checksum: string }) => {
	backup.checksum = createHash('sha256').update(JSON.stringify(backup.team)).digest('hex');
	return JSON.stringify(backup);
};

describe('team backup import treats the file as untrusted input', () => {
	let t: TestDb;
	const storage = memoryStorage();
	let original: string;
	let importer: AppUser;
	let bystander: AppUser;

	beforeAll(async () => {
		t = await createTestDb();
		const teamId = await makeTeam(t.db, 'Origin Team');
		const captain = await makeUser(t.db, 'origin.captain@sagwise.test', 'Origin Captain');
		await addMember(t.db, teamId, captain, 'captain');
		// Someone with an account here whom the file names as a member: the file must not make them one.
		bystander = await makeUser(t.db, 'bystander@sagwise.test', 'Bystander');
		await addMember(t.db, teamId, bystander, 'member');
		importer = await makeUser(t.db, 'importer@sagwise.test', 'Importer');
		const v = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Test car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: captain.id,
		});
		const r = await appendRevision(t.db, {
			buildId: v.buildId,
			parentId: null,
			document: pebbleBuild,
			message: 'First',
			authorId: captain.id,
		});
		if (!r.ok) throw new Error('revision');
		const run = await t.db
			.insertInto('run')
			.values({
				vehicle_id: v.vehicle.id,
				revision_id: r.revision.id,
				ran_at: new Date('2026-05-01T10:00:00Z'),
				author_id: captain.id,
				notes: '',
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const png = new Uint8Array(
			await sharp({ create: { width: 16, height: 16, channels: 3, background: '#777777' } })
				.png()
				.toBuffer(),
		);
		const thumb = new Uint8Array(await sharp(png).webp().toBuffer());
		const base = `teams/${teamId}/runs/${run.id}/photo-1`;
		await storage.put(`${base}.png`, png, 'image/png');
		await storage.put(`${base}-thumb.webp`, thumb, 'image/webp');
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
					size_bytes: png.byteLength,
				},
				{
					team_id: teamId,
					run_id: run.id,
					kind: 'thumbnail',
					object_key: `${base}-thumb.webp`,
					file_name: 'lanes.png (thumbnail)',
					content_type: 'image/webp',
					size_bytes: thumb.byteLength,
				},
			])
			.execute();
		original = JSON.stringify(await exportTeam(t.db, storage, teamId));
	});
	afterAll(async () => t?.drop());

	const upload = (text: string, user: AppUser = importer) => {
		const form = new FormData();
		form.set('file', new Blob([text], { type: 'application/json' }), 'backup.json');
		return callEndpoint(importRoute, {
			locals: localsFor(t.db, user, undefined, storage),
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
		runs: Number(
			(
				await t.db
					.selectFrom('run')
					.select((e) => e.fn.countAll().as('n'))
					.executeTakeFirstOrThrow()
			).n,
		),
		objects: storage.objects.size,
	});
	const edited = (edit: (b: any) => void) => {
		const b = JSON.parse(original);
		edit(b);
		return resign(b);
	};

	it('never adds an existing account to the team: everyone the file names is invited, and the answer is the same for known and unknown addresses', async () => {
		const known = await upload(
			edited(
				(b) =>
					(b.team.members = b.team.members.map((m: any) => ({
						...m,
						role: m.email === 'bystander@sagwise.test' ? 'captain' : m.role,
					}))),
			),
		);
		expect(known.status).toBe(201);
		const a = await known.json();
		const memberships = await t.db
			.selectFrom('membership')
			.select(['user_id', 'role'])
			.where('team_id', '=', a.teamId)
			.execute();
		expect(memberships).toEqual([{ user_id: importer.id, role: 'captain' }]);
		const invited = await t.db
			.selectFrom('invitation')
			.select(['email', 'role'])
			.where('team_id', '=', a.teamId)
			.orderBy('email')
			.execute();
		expect(invited).toEqual([
			{ email: 'bystander@sagwise.test', role: 'captain' },
			{ email: 'origin.captain@sagwise.test', role: 'captain' },
		]);

		// The same file naming addresses nobody has here: the answer has the same keys and counts.
		const unknown = await upload(
			edited(
				(b) =>
					(b.team.members = b.team.members.map((m: any, i: number) => ({
						...m,
						email: `nobody${i}@sagwise.test`,
					}))),
			),
		);
		const u = await unknown.json();
		const shape = ({ teamId, teamName, ...rest }: Record<string, unknown>) => rest;
		expect(shape(u)).toEqual(shape(a));
	});

	it('makes every object key itself, inside the new team, whatever names the file carries', async () => {
		const before = new Set(storage.objects.keys());
		const res = await upload(
			edited((b) => {
				b.team.runs[0].files[0].objectName = '../../../../etc/passwd';
				b.team.runs[0].files[0].fileName = '/etc/shadow\u202e.png';
				b.team.runs[0].files[1].objectName = '../../../../etc/passwd-thumb';
			}),
		);
		expect(res.status).toBe(201);
		const { teamId } = await res.json();
		const added = [...storage.objects.keys()].filter((k) => !before.has(k));
		expect(added).toHaveLength(2);
		for (const key of added)
			expect(key).toMatch(
				new RegExp(
					`^teams/${teamId}/runs/[0-9a-f-]{36}/photo-[0-9a-f-]{36}(-thumb)?\\.(png|webp)$`,
				),
			);
		const rows = await t.db
			.selectFrom('stored_file')
			.select('object_key')
			.where('team_id', '=', teamId)
			.execute();
		expect(rows.map((r) => r.object_key).sort()).toEqual(added.sort());
	});

	it('re-checks every file by its content: a page dressed as a photo or a logger file is refused before anything is written', async () => {
		const start = await counts();
		const html = Buffer.from('<html><script>alert(document.cookie)</script></html>').toString(
			'base64',
		);
		const photo = await upload(
			edited((b) =>
				Object.assign(b.team.runs[0].files[0], { data: html, contentType: 'image/png' }),
			),
		);
		expect(photo.status).toBe(400);
		const body = await photo.json();
		expect(body.code).toBe('invalid_backup');
		expect(body.errors[0].path).toBe('team.runs.0.files.0');

		const elf = Buffer.from([0x7f, 0x45, 0x4c, 0x46, 0, 1, 2, 3]).toString('base64');
		const logger = await upload(
			edited((b) =>
				b.team.runs[0].files.push({
					...b.team.runs[0].files[0],
					key: 'f9',
					kind: 'logger',
					objectName: 'x.csv',
					contentType: 'text/csv',
					data: elf,
				}),
			),
		);
		expect(logger.status).toBe(400);
		expect((await logger.json()).errors[0].path).toBe('team.runs.0.files.2');

		// A receipt on a purchase is checked as a photo upload is.
		const receipt = await upload(
			edited((b) => {
				const purchase = {
					boughtOn: '2026-09-01',
					shelfIndex: null,
					item: 'Fuse holder',
					quantity: 1,
					unitPriceMinor: 2_990,
					paidByEmail: null,
					paidByName: 'Someone',
					notes: '',
					createdAt: '2026-09-01T10:00:00.000Z',
				};
				b.team.seasons = [
					{
						name: 'Hostile',
						startsOn: '2026-01-01',
						endsOn: '2026-12-31',
						budgetMinor: 0,
						createdAt: '2026-01-01T10:00:00.000Z',
						purchases: [
							{ ...purchase, receipt: null },
							{
								...purchase,
								receipt: { fileName: 'till.png', createdAt: purchase.createdAt, data: html },
							},
						],
					},
				];
			}),
		);
		expect(receipt.status).toBe(400);
		expect((await receipt.json()).errors[0].path).toBe('team.seasons.0.purchases.1.receipt');

		// A comment beside a revision the file does not hold.
		const comment = await upload(
			edited((b) => {
				b.team.comments = b.team.comments ?? [];
				b.team.comments.push({
					on: 'revision',
					vehicle: b.team.vehicles[0].key,
					revision: 999,
					authorEmail: null,
					authorName: 'Someone',
					body: 'Orphan',
					createdAt: '2026-09-01T10:00:00.000Z',
					editedAt: null,
				});
			}),
		);
		expect(comment.status).toBe(400);
		expect((await comment.json()).errors[0].path).toMatch(/^team\.comments\.\d+$/);
		expect(await counts()).toEqual(start);
	});

	it('keeps authors and sign-offs as recorded in the file, never as a live account of this installation', async () => {
		const res = await upload(original);
		const { teamId } = await res.json();
		const rev = await t.db
			.selectFrom('revision as r')
			.innerJoin('build as b', 'b.id', 'r.build_id')
			.innerJoin('vehicle as v', 'v.id', 'b.vehicle_id')
			.select(['r.author_id', 'r.imported_by'])
			.where('v.team_id', '=', teamId)
			.executeTakeFirstOrThrow();
		expect(rev).toEqual({ author_id: null, imported_by: 'origin.captain@sagwise.test' });
		const vehicle = await t.db
			.selectFrom('vehicle')
			.select(['owner_id', 'imported_by'])
			.where('team_id', '=', teamId)
			.executeTakeFirstOrThrow();
		expect(vehicle).toEqual({ owner_id: null, imported_by: 'origin.captain@sagwise.test' });
	});

	it('refuses text with control characters and oversized text in the file, naming the record, writing nothing', async () => {
		const start = await counts();
		const nul = await upload(edited((b) => (b.team.vehicles[0].notes = 'fine\u0000then not')));
		expect(nul.status).toBe(400);
		expect((await nul.json()).errors[0].path).toBe('team.vehicles.0.notes');
		const huge = await upload(edited((b) => (b.team.vehicles[0].notes = 'x'.repeat(100_000))));
		expect(huge.status).toBe(400);
		expect((await huge.json()).errors[0].path).toBe('team.vehicles.0.notes');
		expect(await counts()).toEqual(start);
	});

	it('refuses logger samples that are not three finite numbers each, naming the run, writing nothing', async () => {
		const start = await counts();
		const refused = async (text: string) => {
			const res = await upload(text);
			expect(res.status).toBe(400);
			const body = await res.json();
			expect(body.code).toBe('invalid_backup');
			expect(body.errors[0].path).toMatch(/^team\.runs\.0\.samples/);
		};
		await refused(edited((b) => (b.team.runs[0].samples = [[0, 12.6, 10, 99]])));
		await refused(edited((b) => (b.team.runs[0].samples = [[0, '12.6', 10]])));
		await refused(edited((b) => (b.team.runs[0].samples = { 0: [0, 12.6, 10] })));
		// A number JSON can write but no sample can hold: 1e400 reads as Infinity. The checksum is
		// the one a reader computes (JSON.stringify writes Infinity as null).
		const b = JSON.parse(original);
		b.team.runs[0].samples = [
			[0, 12.6, 10],
			[1, 'HUGE', 20],
		];
		b.checksum = createHash('sha256')
			.update(JSON.stringify(b.team).replace('"HUGE"', 'null'))
			.digest('hex');
		await refused(JSON.stringify(b).replace('"HUGE"', '1e400'));
		expect(await counts()).toEqual(start);
	});

	it('reads a file in any slicing alike, and refuses one with a record twice or a key of its own', async () => {
		const whole = await parseBackup(original);
		expect(whole.ok).toBe(true);
		// The same bytes arriving seven at a time: the same team, packed samples and all.
		const bytes = Buffer.from(original);
		const slices = Array.from({ length: Math.ceil(bytes.length / 7) }, (_, i) =>
			bytes.subarray(i * 7, i * 7 + 7),
		);
		const sliced = await readBackup(slices);
		expect(JSON.stringify(sliced)).toBe(JSON.stringify(whole));
		// Trailing white space (an editor's newline) is still the same file.
		expect((await parseBackup(`${original}\n\n`)).ok).toBe(true);

		const start = await counts();
		// "runs" twice: JSON.parse would keep the second; this reader refuses the file.
		const twice = original.replace('"runs":[', '"runs":[],"runs":[');
		const dup = await upload(twice);
		expect(dup.status).toBe(400);
		expect((await dup.json()).detail).toMatch(/appears twice/);
		// A key the format does not have is not kept, so the checksum no longer matches.
		const extra = await upload(edited((b) => (b.team.extra = { anything: true })));
		expect(extra.status).toBe(400);
		expect((await extra.json()).detail).toMatch(/checksum/);
		expect(await counts()).toEqual(start);
	});
});
