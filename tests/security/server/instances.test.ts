import { spawn } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { format } from 'date-fns';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../../db/demo/builds';
import { ensureCluster } from '../../../db/cluster';
import { migrateToLatest } from '../../../db/migrator';
import { DEMO_PASSWORD, DEMO_USERS, seedDemo } from '../../../db/seed';
import { type S3Fake, startS3Fake } from '../../../src/cli/s3-fake';
import { type SmtpFake, startSmtpFake } from '../../../src/cli/smtp-fake';
import { createDb } from '../../../src/lib/server/db/client';
import { listOutbox } from '../../../src/lib/server/dev-outbox';
import { type AppServer, startAppServer } from '../../helpers/app-server';
import { HttpSession } from '../../helpers/http-session';
import { TEST_CLUSTER } from '../../helpers/pg-global-setup';

/**
 * Sagwise as several app instances on one PostgreSQL, one file store and one mail service: two
 * servers (4391, 4392) on a database of this test's own, sharing the fakes and the auth secret.
 */
describe('two app instances behind one database', () => {
	let a: AppServer;
	let b: AppServer;
	let smtp: SmtpFake;
	let s3: S3Fake;
	let dbUrl: string;
	let adminUrl: string;
	let outboxDir: string;
	const name = `instances_${Date.now()}`;
	beforeAll(async () => {
		const cluster = await ensureCluster(TEST_CLUSTER);
		adminUrl = cluster.url();
		const admin = createDb(adminUrl, 1);
		await sql`create database ${sql.id(name)} template ${sql.id(`sagwise_template_${process.env.SAGWISE_TEST_RUN}`)}`.execute(
			admin,
		);
		await admin.destroy();
		dbUrl = cluster.url(name);
		const db = createDb(dbUrl, 1);
		await seedDemo(db);
		await db.destroy();
		outboxDir = mkdtempSync(path.join(tmpdir(), 'sagwise-instances-mail-'));
		smtp = await startSmtpFake({ port: 0, dir: outboxDir });
		s3 = await startS3Fake({
			port: 0,
			dir: mkdtempSync(path.join(tmpdir(), 'sagwise-instances-s3-')),
			bucket: 'sagwise-files',
		});
		const env = {
			DATABASE_URL: dbUrl,
			SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
			SAGWISE_DEV_OUTBOX: outboxDir,
			S3_ENDPOINT: s3.endpoint,
			S3_BUCKET: 'sagwise-files',
		};
		[a, b] = await Promise.all([startAppServer(4391, env), startAppServer(4392, env)]);
	}, 120_000);
	afterAll(async () => {
		await Promise.all([a?.stop(), b?.stop()]);
		await smtp?.close();
		await s3?.close();
		const admin = createDb(adminUrl, 1);
		await sql`drop database if exists ${sql.id(name)} with (force)`.execute(admin);
		await admin.destroy();
	});

	/** The same cookies, sent to the other instance. */
	function sameCookiesOn(from: HttpSession, base: string): HttpSession {
		const other = new HttpSession(base);
		const jar = (s: HttpSession) => (s as unknown as { cookies: Map<string, string> }).cookies;
		for (const [k, v] of jar(from)) jar(other).set(k, v);
		return other;
	}

	it('a session made on one instance is valid on the other', async () => {
		const onA = new HttpSession(a.url);
		expect((await onA.signInWithPassword(DEMO_USERS[1].email, DEMO_PASSWORD)).status).toBe(302);
		const onB = sameCookiesOn(onA, b.url);
		expect((await onB.session())?.user?.email).toBe(DEMO_USERS[1].email);
		expect((await onB.fetch('/api/teams')).status).toBe(200);
	});

	it('sign-in limits count the attempts made on both instances', async () => {
		const email = DEMO_USERS[2].email;
		for (let i = 0; i < 10; i++) {
			const s = new HttpSession(i % 2 ? b.url : a.url);
			const res = await s.signInWithPassword(email, `wrong password ${i}`);
			expect(res.headers.get('location')).toMatch(/error=CredentialsSignin/);
		}
		// The eleventh, on either instance, is refused up front.
		const onA = await new HttpSession(a.url).signInWithPassword(email, 'wrong once more');
		const onB = await new HttpSession(b.url).signInWithPassword(email, DEMO_PASSWORD);
		expect(onA.status).toBe(429);
		expect(onB.status).toBe(429);
	});

	it('two saves on the same head, one on each instance at the same moment: one 201, one 409', async () => {
		const s = new HttpSession(a.url);
		await s.signInWithPassword(DEMO_USERS[1].email, DEMO_PASSWORD);
		const other = sameCookiesOn(s, b.url);
		const [team] = (await (await s.fetch('/api/teams')).json()) as Array<{ id: string }>;
		const vehicles = (await (await s.fetch(`/api/teams/${team!.id}/vehicles`)).json()) as Array<{
			id: string;
			name: string;
			headRevisionId: string;
		}>;
		const v = vehicles.find((x) => x.name === 'Pebble')!;
		const save = (session: HttpSession, message: string) =>
			session.fetch(`/api/teams/${team!.id}/vehicles/${v.id}/revisions`, {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify({ parentId: v.headRevisionId, message, document: pebbleBuild }),
			});
		const answers = await Promise.all([save(s, 'Saved on A'), save(other, 'Saved on B')]);
		expect(answers.map((r) => r.status).sort()).toEqual([201, 409]);
		const conflict = (await answers.find((r) => r.status === 409)!.json()) as {
			code: string;
			head: { parentId: string };
		};
		expect(conflict.code).toBe('conflict');
		expect(conflict.head.parentId).toBe(v.headRevisionId);
	});

	it('the jobs run on two machines at once send each reminder once', async () => {
		const db = createDb(dbUrl, 1);
		const team = await db.selectFrom('team').select(['id']).executeTakeFirstOrThrow();
		await db
			.insertInto('event')
			.values({
				team_id: team.id,
				name: 'Instance Meet',
				starts_on: format(new Date(Date.now() + 86_400_000), 'yyyy-MM-dd'),
				ends_on: format(new Date(Date.now() + 86_400_000), 'yyyy-MM-dd'),
			})
			.execute();
		const members = Number(
			(
				await db
					.selectFrom('membership')
					.select((e) => e.fn.countAll<number>().as('n'))
					.where('team_id', '=', team.id)
					.executeTakeFirstOrThrow()
			).n,
		);
		await db.destroy();
		const job = () =>
			new Promise<number>((resolve) => {
				const child = spawn(process.execPath, ['--import', 'tsx', 'src/cli/jobs.ts', 'reminders'], {
					env: { ...process.env, DATABASE_URL: dbUrl, SMTP_URL: `smtp://127.0.0.1:${smtp.port}` },
					stdio: 'ignore',
				});
				child.once('exit', (code) => resolve(code ?? 1));
			});
		expect(await Promise.all([job(), job()])).toEqual([0, 0]);
		await new Promise((r) => setTimeout(r, 500));
		const reminders = listOutbox(outboxDir).filter((m) => /Instance Meet/.test(m.subject));
		expect(reminders).toHaveLength(members);
		expect(new Set(reminders.map((m) => m.to.join(','))).size).toBe(members);
	}, 60_000);

	it('migrations started by two instances together apply once', async () => {
		const empty = `instances_migrate_${Date.now()}`;
		const admin = createDb(adminUrl, 1);
		await sql`create database ${sql.id(empty)}`.execute(admin);
		const one = createDb(TEST_CLUSTER_URL(adminUrl, empty), 2);
		const two = createDb(TEST_CLUSTER_URL(adminUrl, empty), 2);
		try {
			await Promise.all([migrateToLatest(one), migrateToLatest(two)]);
			const applied = await one
				.selectFrom('kysely_migration' as never)
				.select(sql<string>`name`.as('name'))
				.execute();
			const names = applied.map((r) => (r as { name: string }).name);
			expect(names.length).toBeGreaterThan(5);
			expect(new Set(names).size).toBe(names.length);
		} finally {
			await one.destroy();
			await two.destroy();
			await sql`drop database if exists ${sql.id(empty)} with (force)`.execute(admin);
			await admin.destroy();
		}
	});

	it('a page one instance keeps is never served once the other changes what it shows', async () => {
		const captain = new HttpSession(a.url);
		await captain.signInWithPassword(DEMO_USERS[0].email, DEMO_PASSWORD);
		const captainOnB = sameCookiesOn(captain, b.url);
		const member = new HttpSession(a.url);
		await member.signInWithPassword(DEMO_USERS[1].email, DEMO_PASSWORD);
		const [team] = (await (await captain.fetch('/api/teams')).json()) as Array<{ id: string }>;
		const vehicles = (await (
			await captain.fetch(`/api/teams/${team!.id}/vehicles`)
		).json()) as Array<{
			id: string;
			name: string;
		}>;
		const marlin = vehicles.find((v) => v.name === 'Marlin')!;
		const teamPage = `/teams/${team!.id}`;
		const buildPage = `${teamPage}/vehicles/${marlin.id}`;

		// Kept on A: the same answer twice, and 304 for a browser that holds it.
		const first = await captain.fetch(teamPage);
		const etag = first.headers.get('etag');
		expect(first.status).toBe(200);
		expect(etag).toBeTruthy();
		expect((await captain.fetch(teamPage)).headers.get('etag')).toBe(etag);
		expect((await captain.fetch(teamPage, { headers: { 'if-none-match': etag! } })).status).toBe(
			304,
		);
		expect(await (await captain.fetch(buildPage)).text()).not.toContain('Night-shift wiring');
		// The member's copy is the member's own.
		expect((await member.fetch(teamPage)).headers.get('etag')).not.toBe(etag);

		// B renames the vehicle and changes its description: A's next answers show it.
		const patched = await captainOnB.fetch(`/api/teams/${team!.id}/vehicles/${marlin.id}`, {
			method: 'PATCH',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ name: 'Marlin Mk2', description: 'Night-shift wiring' }),
		});
		expect(patched.status).toBe(200);
		const after = await captain.fetch(teamPage, { headers: { 'if-none-match': etag! } });
		expect(after.status).toBe(200);
		expect(after.headers.get('etag')).not.toBe(etag);
		expect(await after.text()).toContain('Marlin Mk2');
		expect(await (await captain.fetch(buildPage)).text()).toContain('Night-shift wiring');

		// B removes the member: A no longer shows the member the team, kept page or not.
		const members = (await (
			await captain.fetch(`/api/teams/${team!.id}/members`)
		).json()) as Array<{
			userId: string;
			email: string;
		}>;
		const gone = members.find((m) => m.email === DEMO_USERS[1].email)!;
		expect(
			(
				await captainOnB.fetch(`/api/teams/${team!.id}/members/${gone.userId}`, {
					method: 'DELETE',
				})
			).status,
		).toBeLessThan(300);
		expect((await member.fetch(teamPage)).status).toBe(404);
	});
});

/** The URL of another database on the same cluster. */
function TEST_CLUSTER_URL(adminUrl: string, database: string): string {
	const url = new URL(adminUrl);
	url.pathname = `/${database}`;
	return url.href;
}
