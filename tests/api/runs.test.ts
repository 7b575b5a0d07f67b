import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import { type S3Fake, startS3Fake } from '../../src/cli/s3-fake';
import * as events from '../../src/pages/api/teams/[teamId]/events/index';
import * as exportCsv from '../../src/pages/api/teams/[teamId]/runs/export.csv';
import Papa from 'papaparse';
import * as runs from '../../src/pages/api/teams/[teamId]/runs/index';
import * as run from '../../src/pages/api/teams/[teamId]/runs/[runId]/index';
import * as logger from '../../src/pages/api/teams/[teamId]/runs/[runId]/logger';
import type { AppUser } from '../../src/lib/server/auth';
import { appendRevision } from '../../src/lib/server/db/builds';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import { createS3Storage, type Storage } from '../../src/lib/server/storage';
import { HAND_CSV } from '../helpers/logger-fixtures';
import { callEndpoint, jsonRequest } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser, nullMailer } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

describe('events, runs and logger uploads (PostgreSQL + the S3 fake)', () => {
	let t: TestDb;
	let s3: S3Fake;
	let storage: Storage;
	let teamId: string;
	let member: AppUser;
	let vehicleId: string;
	let firstRevision: string;
	let secondRevision: string;
	beforeAll(async () => {
		t = await createTestDb();
		s3 = await startS3Fake({
			port: 0,
			dir: mkdtempSync(path.join(tmpdir(), 'sagwise-s3-')),
			bucket: 'test-files',
		});
		storage = createS3Storage({
			endpoint: s3.endpoint,
			region: 'us-east-1',
			bucket: 'test-files',
			accessKeyId: 'S3RVER',
			secretAccessKey: 'S3RVER',
			forcePathStyle: true,
		});
		teamId = await makeTeam(t.db, 'Run Team');
		member = await makeUser(t.db);
		await addMember(t.db, teamId, member, 'member');
		const v = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Logger car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		vehicleId = v.vehicle.id;
		const r1 = await appendRevision(t.db, {
			buildId: v.buildId,
			parentId: null,
			document: pebbleBuild,
			message: 'One',
			authorId: member.id,
		});
		if (!r1.ok) throw new Error('r1');
		firstRevision = r1.revision.id;
		await new Promise((r) => setTimeout(r, 20));
		const r2 = await appendRevision(t.db, {
			buildId: v.buildId,
			parentId: r1.revision.id,
			document: pebbleBuild,
			message: 'Two',
			authorId: member.id,
		});
		if (!r2.ok) throw new Error('r2');
		secondRevision = r2.revision.id;
	});
	afterAll(async () => {
		await s3?.close();
		await t?.drop();
	});

	const locals = () => localsFor(t.db, member, nullMailer, storage);
	const call = (
		module: Parameters<typeof callEndpoint>[0],
		method: string,
		params: Record<string, string>,
		body?: unknown,
		query = '',
	) =>
		callEndpoint(module, {
			locals: locals(),
			params: { teamId, ...params },
			request: jsonRequest(`/x${query}`, method, body),
		});
	const upload = (
		runId: string,
		file: Blob | null,
		name: string,
		mapping: Record<string, string> = {
			timeColumn: 'time',
			voltsColumn: 'volts',
			ampsColumn: 'amps',
			timeUnit: 's',
		},
	) => {
		const form = new FormData();
		if (file) form.set('file', file, name);
		for (const [k, v] of Object.entries(mapping)) form.set(k, v);
		return callEndpoint(logger, {
			locals: locals(),
			params: { teamId, runId },
			request: new Request('http://localhost/x', { method: 'POST', body: form }),
		});
	};
	const newRun = async (ranAt: string) =>
		(await (
			await call(
				runs,
				'POST',
				{},
				{ vehicleId, ranAt, scoreDb: 142.3, restingV: 12.8, minV: 11.9, allowDuplicate: true },
			)
		).json()) as { id: string; revisionId: string };
	/** How many runs the database holds with a client key. */
	const rowsWithKey = async (clientKey: string) =>
		Number(
			(
				await t.db
					.selectFrom('run')
					.select((eb) => eb.fn.countAll().as('n'))
					.where('client_key', '=', clientKey)
					.executeTakeFirstOrThrow()
			).n,
		);
	const storedKeys = async (runId: string) =>
		(
			await t.db
				.selectFrom('stored_file')
				.select('object_key')
				.where('run_id', '=', runId)
				.execute()
		).map((r) => r.object_key);
	const sampleCount = async (runId: string) =>
		Number(
			(
				await t.db
					.selectFrom('run_sample')
					.select((eb) => eb.fn.countAll().as('n'))
					.where('run_id', '=', runId)
					.executeTakeFirstOrThrow()
			).n,
		);

	it('links a run to the revision in force at its time, and to an event of the team', async () => {
		const ev = await (
			await call(
				events,
				'POST',
				{},
				{ name: 'Spring meet', startsOn: '2026-04-11', endsOn: '2026-04-12' },
			)
		).json();
		const early = await (
			await call(
				runs,
				'POST',
				{},
				{ vehicleId, eventId: ev.id, ranAt: new Date(Date.now() - 86_400_000).toISOString() },
			)
		).json();
		expect(early.revisionId).toBeNull(); // before the first revision existed
		const now = await newRun(new Date().toISOString());
		expect(now.revisionId).toBe(secondRevision);
		const chosen = await (
			await call(
				runs,
				'POST',
				{},
				{ vehicleId, ranAt: new Date().toISOString(), revisionId: firstRevision },
			)
		).json();
		expect(chosen.revisionId).toBe(firstRevision);
		const bad = await call(
			runs,
			'POST',
			{},
			{
				vehicleId,
				ranAt: new Date().toISOString(),
				eventId: '00000000-0000-4000-8000-000000000000',
			},
		);
		expect(bad.status).toBe(400);
		expect((await bad.json()).errors[0].path).toBe('eventId');
	});

	it('puts a run made in the same second as a save on the new revision, whatever the offset it was typed in', async () => {
		const rev = await t.db
			.selectFrom('revision')
			.select('created_at')
			.where('id', '=', secondRevision)
			.executeTakeFirstOrThrow();
		// The same instant written in two zones, truncated to the second (a fraction before the save).
		const second = new Date(Math.floor(rev.created_at.getTime() / 1000) * 1000);
		const inUtc = second.toISOString().replace(/\.\d{3}Z$/, 'Z');
		const local = new Date(second.getTime() + 150 * 60_000).toISOString().slice(0, 19) + '+02:30';
		for (const ranAt of [inUtc, local]) {
			const res = await call(runs, 'POST', {}, { vehicleId, ranAt, allowDuplicate: true });
			const body = await res.json();
			expect(res.status).toBe(201);
			expect(body.revisionId).toBe(secondRevision);
			expect(body.ranAtOffsetMin).toBe(ranAt.endsWith('Z') ? 0 : 150);
		}
		const before = new Date(second.getTime() - 1000).toISOString();
		const earlier = await (await call(runs, 'POST', {}, { vehicleId, ranAt: before })).json();
		// A second before the save: never the new revision (the first was saved in the same second or none).
		expect(earlier.revisionId).not.toBe(secondRevision);
	});

	it('asks before a likely duplicate, and a retried write with the same client key makes one run', async () => {
		const body = { vehicleId, ranAt: '2026-05-09T11:22:33+01:00', scoreDb: 139.4 };
		expect((await call(runs, 'POST', {}, body)).status).toBe(201);
		const twin = await call(runs, 'POST', {}, body);
		expect(twin.status).toBe(409);
		expect((await twin.json()).code).toBe('possible_duplicate');
		expect((await call(runs, 'POST', {}, { ...body, allowDuplicate: true })).status).toBe(201);
		const clientKey = crypto.randomUUID();
		const keyed = { vehicleId, ranAt: '2026-05-09T12:00:00Z', scoreDb: 140.1, clientKey };
		const first = await call(runs, 'POST', {}, keyed);
		const retry = await call(runs, 'POST', {}, keyed);
		expect([first.status, retry.status]).toEqual([201, 200]);
		expect((await retry.json()).id).toBe((await first.json()).id);
		expect(await rowsWithKey(clientKey)).toBe(1);
	});

	it('answers ten identical posts made at once with one run, all 2xx, and a different key still asks', async () => {
		const clientKey = crypto.randomUUID();
		const keyed = { vehicleId, ranAt: '2026-05-10T09:08:07Z', scoreDb: 141.7, clientKey };
		const answers = await Promise.all(
			Array.from({ length: 10 }, () => call(runs, 'POST', {}, keyed)),
		);
		const statuses = answers.map((a) => a.status).sort();
		expect(statuses.filter((s) => s === 201)).toHaveLength(1);
		expect(statuses.every((s) => s === 200 || s === 201)).toBe(true);
		const ids = new Set(await Promise.all(answers.map(async (a) => (await a.json()).id)));
		expect(ids.size).toBe(1);
		expect(await rowsWithKey(clientKey)).toBe(1);
		// Another device's run at the same second with the same score is still a likely duplicate.
		const other = await call(runs, 'POST', {}, { ...keyed, clientKey: crypto.randomUUID() });
		expect(other.status).toBe(409);
		expect((await other.json()).code).toBe('possible_duplicate');
	});

	it('flags typed voltages that disagree with the logger file, keeping both', async () => {
		const created = await (
			await call(
				runs,
				'POST',
				{},
				{ vehicleId, ranAt: '2026-05-10T09:00:00Z', restingV: 12.7, minV: 9.1 },
			)
		).json();
		expect(
			(await upload(created.id, new Blob([HAND_CSV], { type: 'text/csv' }), 'log.csv')).ok,
		).toBe(true);
		const after = await (await call(run, 'GET', { runId: created.id })).json();
		expect(after.run.logger.minV).toBeCloseTo(after.analysis.minVolts, 9);
		expect(after.run.minV).toBe(9.1);
		expect(after.run.mismatches.map((m: { field: string }) => m.field)).toContain('minV');
	});

	it('stores an uploaded logger file in S3, its samples in PostgreSQL, and analyses it like the hand computation', async () => {
		const r = await newRun(new Date().toISOString());
		const res = await upload(r.id, new Blob([HAND_CSV], { type: 'text/csv' }), 'burp.csv');
		expect(res.status).toBe(201);
		const body = await res.json();
		expect(body.samples).toBe(4);
		expect(body.analysis.energyWh).toBeCloseTo(4300 / 3600, 9);
		expect(body.analysis.effective.resistanceOhm).toBeCloseTo(0.002, 9);
		const [key] = await storedKeys(r.id);
		expect(new TextDecoder().decode((await storage.get(key!))!)).toBe(HAND_CSV);
		expect(await sampleCount(r.id)).toBe(4);
		const got = await (await call(run, 'GET', { runId: r.id })).json();
		expect(got.samples[2]).toEqual({ tS: 2, volts: 12.2, amps: 200 });
		expect(got.analysis.minVolts).toBe(12.2);
	});

	it.each([
		['a missing column', 'time,volts\n0,12\n1,12\n', /current column "amps"/],
		['text in a number column', 'time,volts,amps\n0,12.6,0\n1,abc,3\n', /Row 3/],
		['an empty file', '', /empty/],
	])('refuses %s with a clear message and stores nothing', async (_what, csv, message) => {
		const r = await newRun(new Date().toISOString());
		const res = await upload(r.id, new Blob([csv], { type: 'text/csv' }), 'bad.csv');
		expect(res.status).toBe(400);
		expect((await res.json()).detail).toMatch(message);
		expect(await storedKeys(r.id)).toEqual([]);
		expect(await sampleCount(r.id)).toBe(0);
	});

	it('refuses a 50 MB file with 413 and stores nothing', async () => {
		const r = await newRun(new Date().toISOString());
		const big = new Blob([`time,volts,amps\n${'0,12.0,100\n'.repeat(5_000_000)}`]);
		expect(big.size).toBeGreaterThan(50_000_000);
		const res = await upload(r.id, big, 'huge.csv');
		expect(res.status).toBe(413);
		expect(await storedKeys(r.id)).toEqual([]);
	});

	it('refuses a photo renamed to .csv (checked by content, not name)', async () => {
		const r = await newRun(new Date().toISOString());
		const png = new Uint8Array([
			0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 73, 72, 68, 82,
		]);
		const res = await upload(r.id, new Blob([png]), 'photo.csv');
		expect(res.status).toBe(400);
		expect((await res.json()).detail).toMatch(/not a CSV/);
		expect(await storedKeys(r.id)).toEqual([]);
	});

	it('exports runs as CSV, neutralising spreadsheet formulas in notes', async () => {
		await call(
			runs,
			'POST',
			{},
			{ vehicleId, ranAt: new Date().toISOString(), scoreDb: 150.1, notes: '=HYPERLINK("x")' },
		);
		const res = await call(exportCsv, 'GET', {}, undefined, `?vehicleId=${vehicleId}`);
		expect(res.headers.get('content-type')).toMatch(/text\/csv/);
		const text = await res.text();
		expect(text.split(/\r?\n/)[0]).toBe(
			'ran_at,vehicle,event,revision,score_db,frequency_hz,resting_v,min_v,ambient_c,resting_v_typed,min_v_typed,voltages_from,notes',
		);
		expect(text).toContain('150.1');
		expect(text).not.toMatch(/,=HYPERLINK/);
	});

	it('exports a run’s voltages from its logger file, with the typed ones beside', async () => {
		const r = await newRun(new Date(Date.now() - 3_600_000).toISOString());
		expect((await upload(r.id, new Blob([HAND_CSV]), 'burp.csv')).status).toBe(201);
		const list = (await (
			await call(runs, 'GET', {}, undefined, `?vehicleId=${vehicleId}`)
		).json()) as {
			id: string;
			ranAt: string;
			logger: { minV: number } | null;
		}[];
		const mine = list.find((x) => x.id === r.id)!;
		const logged = mine.logger!;
		const res = await call(exportCsv, 'GET', {}, undefined, `?vehicleId=${vehicleId}`);
		const rows = Papa.parse<Record<string, string>>(await res.text(), { header: true }).data;
		const row = rows.find((x) => x.ran_at === mine.ranAt)!;
		expect(Number(row.min_v)).toBeCloseTo(logged.minV, 9);
		expect(Number(row.min_v_typed)).toBe(11.9);
		expect(row.voltages_from).toBe('logger');
	});

	it('pages the runs list: the newest first page, then older ones by the Link header, none lost or repeated', async () => {
		// Three runs in the same second: a page boundary must not drop or repeat one of them.
		const second = new Date(Date.now() - 7 * 86_400_000).toISOString();
		for (let i = 0; i < 3; i++) await newRun(second);
		const all = (await (
			await call(runs, 'GET', {}, undefined, `?vehicleId=${vehicleId}`)
		).json()) as { id: string; ranAt: string }[];
		expect(all.length).toBeGreaterThanOrEqual(4);
		const seen: string[] = [];
		let query = `?vehicleId=${vehicleId}&limit=2`;
		for (let pages = 0; query && pages < 50; pages++) {
			const res = await call(runs, 'GET', {}, undefined, query);
			expect(res.status).toBe(200);
			const page = (await res.json()) as { id: string; ranAt: string }[];
			expect(page.length).toBeLessThanOrEqual(2);
			// Oldest first within a page; pages go from newest to oldest.
			seen.unshift(...page.map((r) => r.id));
			const next = /<([^>]+)>; rel="next"/.exec(res.headers.get('link') ?? '')?.[1];
			query = next ? next.slice(next.indexOf('?')) : '';
		}
		expect(seen).toEqual(all.map((r) => r.id));
		const bad = await call(runs, 'GET', {}, undefined, '?limit=100000');
		expect(bad.status).toBe(400);
	});

	it('deletes a run with its samples and stored file', async () => {
		const r = await newRun(new Date().toISOString());
		await upload(r.id, new Blob([HAND_CSV]), 'burp.csv');
		const [key] = await storedKeys(r.id);
		expect((await call(run, 'DELETE', { runId: r.id })).status).toBe(204);
		expect(await sampleCount(r.id)).toBe(0);
		expect(await storage.get(key!)).toBeNull();
	});
});

describe('run photos (PostgreSQL + the S3 fake)', async () => {
	const sharp = (await import('sharp')).default;
	const photos = await import('../../src/pages/api/teams/[teamId]/runs/[runId]/photos');
	const files = await import('../../src/pages/api/teams/[teamId]/files/[fileId]');
	let t: TestDb;
	let s3: S3Fake;
	let storage: Storage;
	let teamId: string;
	let member: AppUser;
	let runId: string;
	beforeAll(async () => {
		t = await createTestDb();
		s3 = await startS3Fake({
			port: 0,
			dir: mkdtempSync(path.join(tmpdir(), 'sagwise-s3p-')),
			bucket: 'photo-files',
		});
		storage = createS3Storage({
			endpoint: s3.endpoint,
			region: 'us-east-1',
			bucket: 'photo-files',
			accessKeyId: 'S3RVER',
			secretAccessKey: 'S3RVER',
			forcePathStyle: true,
		});
		teamId = await makeTeam(t.db);
		member = await makeUser(t.db);
		await addMember(t.db, teamId, member, 'member');
		const v = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Photo car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		runId = (
			await t.db
				.insertInto('run')
				.values({ vehicle_id: v.vehicle.id, ran_at: new Date() })
				.returning('id')
				.executeTakeFirstOrThrow()
		).id;
	});
	afterAll(async () => {
		await s3?.close();
		await t?.drop();
	});
	const post = (blob: Blob, name: string) => {
		const form = new FormData();
		form.set('file', blob, name);
		return callEndpoint(photos, {
			locals: localsFor(t.db, member, nullMailer, storage),
			params: { teamId, runId },
			request: new Request('http://localhost/x', { method: 'POST', body: form }),
		});
	};

	it('stores a photo checked by content with a 320 px WebP thumbnail, and serves both', async () => {
		const png = await sharp({
			create: { width: 1200, height: 800, channels: 3, background: '#b8652a' },
		})
			.png()
			.toBuffer();
		const res = await post(new Blob([new Uint8Array(png)]), 'meter.jpg');
		expect(res.status).toBe(201);
		const { photoId, thumbnailId } = await res.json();
		const get = (fileId: string) =>
			callEndpoint(files, {
				locals: localsFor(t.db, member, nullMailer, storage),
				params: { teamId, fileId },
				request: new Request('http://localhost/x'),
			});
		const original = await get(photoId);
		expect(original.headers.get('content-type')).toBe('image/png');
		expect(Buffer.from(await original.arrayBuffer()).equals(png)).toBe(true);
		const thumb = await get(thumbnailId);
		const meta = await sharp(Buffer.from(await thumb.arrayBuffer())).metadata();
		expect(meta).toMatchObject({ format: 'webp', width: 320, height: 213 });
	});

	it('refuses a CSV renamed to .jpg and stores nothing', async () => {
		const res = await post(new Blob(['time,volts,amps\n0,1,2\n']), 'fake.jpg');
		expect(res.status).toBe(400);
		expect((await res.json()).detail).toMatch(/JPEG, PNG or WebP/);
		expect(
			await t.db
				.selectFrom('stored_file')
				.selectAll()
				.where('run_id', '=', runId)
				.where('file_name', '=', 'fake.jpg')
				.execute(),
		).toEqual([]);
	});
});
