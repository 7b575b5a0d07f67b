import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type ClusterOptions, ensureCluster, stopCluster } from '../../../db/cluster';
import { migrateToLatest } from '../../../db/migrator';
import { DEMO_PASSWORD, DEMO_USERS, seedDemo } from '../../../db/seed';
import { type S3Fake, startS3Fake } from '../../../src/cli/s3-fake';
import { startSmtpFake, type SmtpFake } from '../../../src/cli/smtp-fake';
import { createDb } from '../../../src/lib/server/db/client';
import { type AppServer, startAppServer } from '../../helpers/app-server';
import { type FreezeProxy, startFreezeProxy } from '../../helpers/freeze-proxy';
import { HttpSession } from '../../helpers/http-session';

/**
 * Real services stopped under a real server: a PostgreSQL cluster of this test's own (so stopping
 * it disturbs no other test), the S3 fake behind a relay that can also freeze it.
 */
const CLUSTER: ClusterOptions = {
	dir: '.data/test-pg-faults',
	port: Number(process.env.SAGWISE_TEST_FAULT_PG_PORT ?? 54349),
	database: 'faults',
};
const PORT = Number(process.env.SAGWISE_TEST_FAULT_APP_PORT ?? 4398);
const S3_TIMEOUT_MS = 1500;

describe('faults: the database and the file store go away under load', () => {
	let server: AppServer;
	let s3: S3Fake;
	let s3Port: number;
	let s3Dir: string;
	let proxy: FreezeProxy;
	let smtp: SmtpFake;
	let dbUrl: string;
	let teamId: string;
	let runId: string;
	let member: HttpSession;
	let photo: Uint8Array;

	beforeAll(async () => {
		stopCluster(CLUSTER);
		const cluster = await ensureCluster(CLUSTER);
		dbUrl = cluster.url('faults');
		const admin = createDb(cluster.url(), 1);
		const { sql } = await import('kysely');
		await sql`drop database if exists faults with (force)`.execute(admin);
		await sql`create database faults`.execute(admin);
		await admin.destroy();
		const db = createDb(dbUrl, 1);
		await migrateToLatest(db);
		teamId = await seedDemo(db);
		runId = (
			await db
				.selectFrom('run')
				.innerJoin('vehicle', 'vehicle.id', 'run.vehicle_id')
				.select('run.id')
				.where('vehicle.team_id', '=', teamId)
				.executeTakeFirstOrThrow()
		).id;
		await db.destroy();

		s3Dir = mkdtempSync(path.join(tmpdir(), 'sagwise-fault-s3-'));
		s3 = await startS3Fake({ port: 0, dir: s3Dir, bucket: 'sagwise-files' });
		s3Port = Number(new URL(s3.endpoint).port);
		proxy = await startFreezeProxy(s3Port);
		smtp = await startSmtpFake({
			port: 0,
			dir: mkdtempSync(path.join(tmpdir(), 'sagwise-fault-mail-')),
		});
		server = await startAppServer(PORT, {
			DATABASE_URL: dbUrl,
			SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
			S3_ENDPOINT: `http://127.0.0.1:${proxy.port}`,
			S3_BUCKET: 'sagwise-files',
			SAGWISE_S3_TIMEOUT_MS: String(S3_TIMEOUT_MS),
		});
		member = new HttpSession(server.url);
		const signedIn = await member.signInWithPassword(DEMO_USERS[1].email, DEMO_PASSWORD);
		expect(signedIn.status).toBe(302);
		photo = new Uint8Array(
			await sharp({ create: { width: 64, height: 48, channels: 3, background: '#446688' } })
				.jpeg()
				.toBuffer(),
		);
	}, 120_000);

	afterAll(async () => {
		await server?.stop();
		await proxy?.close();
		await s3?.close().catch(() => undefined);
		await smtp?.close();
		stopCluster(CLUSTER);
	});

	const postEvent = (n: number) =>
		member.fetch(`/api/teams/${teamId}/events`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({
				name: `Load event ${n}`,
				startsOn: '2027-03-01',
				endsOn: '2027-03-01',
			}),
		});
	const postPhoto = () => {
		const form = new FormData();
		form.set(
			'file',
			new Blob([photo as Uint8Array<ArrayBuffer>], { type: 'image/jpeg' }),
			'lanes.jpg',
		);
		return member.fetch(`/api/teams/${teamId}/runs/${runId}/photos`, {
			method: 'POST',
			body: form,
		});
	};

	it('lives through PostgreSQL stopped immediately under write load: 503 problem+json meanwhile, recovers by itself, keeps every acknowledged write', async () => {
		const acknowledged: string[] = [];
		const outcomes: { status: number; type: string; code?: string; phase: string }[] = [];
		const networkErrors: string[] = [];
		let phase = 'before';
		let stop = false;
		let n = 0;
		const writer = async () => {
			while (!stop) {
				const i = n++;
				try {
					const res = await postEvent(i);
					const type = res.headers.get('content-type') ?? '';
					const body = (await res.json()) as { id?: string; code?: string };
					outcomes.push({ status: res.status, type, code: body.code, phase });
					if (res.status === 201 && body.id) acknowledged.push(body.id);
				} catch (error) {
					networkErrors.push(String(error));
				}
				await new Promise((r) => setTimeout(r, 20));
			}
		};
		const writers = Array.from({ length: 4 }, writer);
		await new Promise((r) => setTimeout(r, 800));
		phase = 'down';
		stopCluster(CLUSTER, 'immediate');
		await new Promise((r) => setTimeout(r, 2500));
		const healthDown = await fetch(`${server.url}/api/health`);
		expect(healthDown.status).toBe(503);
		expect(healthDown.headers.get('content-type')).toBe('application/problem+json');
		expect((await healthDown.json()).database.status).toBe('down');
		// A person opening a page meanwhile is told so in a page, with the status that fits.
		const page = await member.fetch(`/teams/${teamId}`, { headers: { accept: 'text/html' } });
		expect(page.status).toBe(503);
		expect(page.headers.get('content-type')).toMatch(/text\/html/);
		expect(await page.text()).toMatch(/cannot reach its data/);
		phase = 'restarting';
		await ensureCluster(CLUSTER);
		phase = 'back';
		const deadline = Date.now() + 20_000;
		while (Date.now() < deadline && !outcomes.some((o) => o.phase === 'back' && o.status === 201))
			await new Promise((r) => setTimeout(r, 100));
		await new Promise((r) => setTimeout(r, 500));
		stop = true;
		await Promise.all(writers);

		expect(server.process.exitCode).toBeNull();
		expect(networkErrors).toEqual([]);
		// Every answer was either a stored write or a 503 problem saying the database is away.
		const unexpected = outcomes.filter(
			(o) =>
				!(
					o.status === 201 ||
					(o.status === 503 &&
						o.type === 'application/problem+json' &&
						o.code === 'database_unavailable')
				),
		);
		expect(unexpected).toEqual([]);
		expect(outcomes.filter((o) => o.phase === 'down' && o.status === 503).length).toBeGreaterThan(
			0,
		);
		expect(outcomes.filter((o) => o.phase === 'back' && o.status === 201).length).toBeGreaterThan(
			0,
		);
		expect((await fetch(`${server.url}/api/health`)).status).toBe(200);

		const db = createDb(dbUrl, 1);
		try {
			const stored = await db
				.selectFrom('event')
				.select('id')
				.where('id', 'in', acknowledged)
				.execute();
			expect(stored.length).toBe(acknowledged.length);
		} finally {
			await db.destroy();
		}
	}, 90_000);

	it('answers 503 problem+json while the file store is stopped, reports it in /api/health, and recovers when it is back', async () => {
		expect((await postPhoto()).status).toBe(201);
		await s3.close();
		const refused = await postPhoto();
		expect(refused.status).toBe(503);
		expect(refused.headers.get('content-type')).toBe('application/problem+json');
		expect((await refused.json()).code).toBe('storage_unavailable');
		const health = await fetch(`${server.url}/api/health`);
		expect(health.status).toBe(503);
		const report = await health.json();
		expect(report).toMatchObject({
			database: { status: 'ok' },
			storage: { status: 'down' },
			code: 'storage_unavailable',
		});

		s3 = await startS3Fake({ port: s3Port, dir: s3Dir, bucket: 'sagwise-files' });
		expect((await postPhoto()).status).toBe(201);
		expect((await fetch(`${server.url}/api/health`)).status).toBe(200);
	}, 60_000);

	it('ends a backup download unfinished when the file store stops part way, and keeps serving', async () => {
		expect((await postPhoto()).status).toBe(201);
		await s3.close();
		try {
			const res = await member.fetch(`/api/teams/${teamId}/export`);
			const text = await res.text();
			// The answer began before the files were read: it ends, unfinished, and reads as no backup.
			expect(res.status).toBe(200);
			expect(() => JSON.parse(text)).toThrow();
			expect(server.process.exitCode).toBeNull();
			const health = await fetch(`${server.url}/api/health`);
			expect(health.status).toBe(503);
		} finally {
			s3 = await startS3Fake({ port: s3Port, dir: s3Dir, bucket: 'sagwise-files' });
		}
		const again = await member.fetch(`/api/teams/${teamId}/export`);
		expect(again.status).toBe(200);
		expect(JSON.parse(await again.text())).toMatchObject({ format: expect.any(String) });
	}, 60_000);

	it('does not hang on a frozen file store: every storage call has a deadline', async () => {
		proxy.freeze();
		try {
			const started = Date.now();
			const res = await postPhoto();
			const waited = Date.now() - started;
			expect(res.status).toBe(503);
			expect((await res.json()).code).toBe('storage_unavailable');
			// Two attempts of at most the deadline each, not forever.
			expect(waited).toBeLessThan(S3_TIMEOUT_MS * 2 + 5000);
			expect(server.process.exitCode).toBeNull();
		} finally {
			proxy.thaw();
		}
		expect((await postPhoto()).status).toBe(201);
	}, 60_000);
});
