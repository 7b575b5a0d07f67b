import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AppUser } from '../../src/lib/server/auth';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import { sweepOrphanObjects } from '../../src/lib/server/object-cleanup';
import * as team from '../../src/pages/api/teams/[teamId]';
import * as file from '../../src/pages/api/teams/[teamId]/files/[fileId]';
import * as photos from '../../src/pages/api/teams/[teamId]/runs/[runId]/photos';
import * as runRoute from '../../src/pages/api/teams/[teamId]/runs/[runId]/index';
import { callEndpoint, jsonRequest } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser, memoryStorage } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

describe('stored files: served safely, stripped of metadata, removed with what owns them', () => {
	let t: TestDb;
	const storage = memoryStorage();
	let captain: AppUser;
	let teamId: string;
	let runId: string;

	const newRun = async (team: string) => {
		const v = await insertVehicleWithBuild(t.db, {
			teamId: team,
			name: 'File car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		return (
			await t.db
				.insertInto('run')
				.values({ vehicle_id: v.vehicle.id, ran_at: new Date(), notes: '' })
				.returning('id')
				.executeTakeFirstOrThrow()
		).id;
	};
	const upload = (team: string, run: string, bytes: Uint8Array, name: string) => {
		const form = new FormData();
		form.set('file', new Blob([bytes as Uint8Array<ArrayBuffer>]), name);
		return callEndpoint(photos, {
			locals: localsFor(t.db, captain, undefined, storage),
			params: { teamId: team, runId: run },
			request: new Request('http://localhost/x', { method: 'POST', body: form }),
		});
	};

	beforeAll(async () => {
		t = await createTestDb();
		captain = await makeUser(t.db);
		teamId = await makeTeam(t.db, 'File Team');
		await addMember(t.db, teamId, captain, 'captain');
		runId = await newRun(teamId);
	});
	afterAll(async () => t?.drop());

	it('stores a phone photo without its EXIF, GPS position or camera details', async () => {
		const phone = await sharp({
			create: { width: 40, height: 30, channels: 3, background: '#335577' },
		})
			.jpeg()
			.withExif({
				IFD0: { Make: 'PhoneMaker', Model: 'Model X1', Copyright: 'Someone' },
				IFD3: {
					GPSLatitudeRef: 'N',
					GPSLatitude: '51/1 28/1 0/1',
					GPSLongitudeRef: 'W',
					GPSLongitude: '0/1 7/1 0/1',
				},
			})
			.toBuffer();
		expect((await sharp(phone).metadata()).exif).toBeDefined();
		const res = await upload(teamId, runId, new Uint8Array(phone), 'IMG_0001.jpg');
		expect(res.status).toBe(201);
		expect((await res.json()).metadataRemoved).toBe(true);
		const row = await t.db
			.selectFrom('stored_file')
			.select('object_key')
			.where('run_id', '=', runId)
			.where('kind', '=', 'photo')
			.executeTakeFirstOrThrow();
		const stored = storage.objects.get(row.object_key)!;
		const meta = await sharp(stored).metadata();
		expect(meta.exif).toBeUndefined();
		expect(meta.xmp).toBeUndefined();
		expect(Buffer.from(stored).includes('PhoneMaker')).toBe(false);
		expect(meta.width).toBe(40);
	});

	it('serves a stored file as the image it was checked to be, or else as an opaque attachment, never sniffed and sandboxed', async () => {
		const photo = await t.db
			.selectFrom('stored_file')
			.select('id')
			.where('run_id', '=', runId)
			.where('kind', '=', 'photo')
			.executeTakeFirstOrThrow();
		const get = (id: string) =>
			callEndpoint(file, {
				locals: localsFor(t.db, captain, undefined, storage),
				params: { teamId, fileId: id },
				request: jsonRequest('/x', 'GET'),
			});
		const ok = await get(photo.id);
		expect(ok.headers.get('content-type')).toBe('image/jpeg');
		expect(ok.headers.get('content-disposition')).toMatch(/^inline/);
		expect(ok.headers.get('x-content-type-options')).toBe('nosniff');
		expect(ok.headers.get('content-security-policy')).toMatch(/sandbox/);

		// A row that claims an image while the bytes are a page (as old or forged data could).
		const key = `teams/${teamId}/runs/${runId}/photo-forged.png`;
		await storage.put(
			key,
			new TextEncoder().encode('<html><script>fetch("/api/teams")</script>'),
			'image/png',
		);
		const forged = await t.db
			.insertInto('stored_file')
			.values({
				team_id: teamId,
				run_id: runId,
				kind: 'photo',
				object_key: key,
				file_name: 'x.html',
				content_type: 'image/png',
				size_bytes: 40,
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const res = await get(forged.id);
		expect(res.headers.get('content-type')).toBe('application/octet-stream');
		expect(res.headers.get('content-disposition')).toMatch(/^attachment/);
		expect(res.headers.get('content-security-policy')).toMatch(/default-src 'none'.*sandbox/);
		await t.db.deleteFrom('stored_file').where('id', '=', forged.id).execute();
		await storage.remove(key);
	});

	it('deleting a run and deleting a team remove their stored files', async () => {
		const other = await makeTeam(t.db, 'Doomed Team');
		await addMember(t.db, other, captain, 'captain');
		const doomedRun = await newRun(other);
		const png = new Uint8Array(
			await sharp({ create: { width: 8, height: 8, channels: 3, background: '#000000' } })
				.png()
				.toBuffer(),
		);
		expect((await upload(other, doomedRun, png, 'a.png')).status).toBe(201);
		const secondRun = await newRun(other);
		expect((await upload(other, secondRun, png, 'b.png')).status).toBe(201);
		const under = (prefix: string) =>
			[...storage.objects.keys()].filter((k) => k.startsWith(prefix));
		expect(under(`teams/${other}/`)).toHaveLength(4);

		const del = await callEndpoint(runRoute, {
			locals: localsFor(t.db, captain, undefined, storage),
			params: { teamId: other, runId: doomedRun },
			request: jsonRequest('/x', 'DELETE'),
		});
		expect(del.status).toBe(204);
		expect(under(`teams/${other}/runs/${doomedRun}/`)).toEqual([]);

		const gone = await callEndpoint(team, {
			locals: localsFor(t.db, captain, undefined, storage),
			params: { teamId: other },
			request: jsonRequest('/x', 'DELETE', { confirmName: 'Doomed Team' }),
		});
		expect(gone.status).toBe(204);
		expect(under(`teams/${other}/`)).toEqual([]);
		// The first team's files are untouched.
		expect(under(`teams/${teamId}/`).length).toBeGreaterThan(0);
	});

	it('the sweep job removes stored objects no row points at, and nothing else', async () => {
		const kept = [...storage.objects.keys()];
		storage.objects.set(
			`teams/${teamId}/runs/${runId}/photo-left-by-a-crash.png`,
			new Uint8Array([1, 2, 3]),
		);
		storage.objects.set(
			`teams/00000000-0000-4000-8000-000000000000/runs/x/logger-y.csv`,
			new Uint8Array([4]),
		);
		expect(await sweepOrphanObjects(t.db, storage)).toBe(2);
		expect([...storage.objects.keys()].sort()).toEqual(kept.sort());
		expect(await sweepOrphanObjects(t.db, storage)).toBe(0);
	});
});
