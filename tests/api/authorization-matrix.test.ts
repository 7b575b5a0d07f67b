import { readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import type { AppUser } from '../../src/lib/server/auth';
import { appendRevision } from '../../src/lib/server/db/builds';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import { insertPlan } from '../../src/lib/server/db/plans';
import { exportTeam } from '../../src/lib/server/team-backup';
import { hashToken } from '../../src/lib/server/tokens';
import { callEndpoint, type EndpointModule, jsonRequest } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser, memoryStorage } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { shelfBank } from '../helpers/shelf';
import { insertShelfItems } from '../../src/lib/server/db/shelf';
import { insertPurchase, insertSeason } from '../../src/lib/server/db/seasons';

/**
 * Every team route, called as anonymous, viewer, member, captain and the captain of another team.
 * The list of route files is read from disk, so a new route without an entry here fails the test.
 */
type Caller = 'anonymous' | 'viewer' | 'member' | 'captain' | 'outsider';
type Expect = Record<Caller, number>;

interface World {
	teamId: string;
	teamName: string;
	users: Record<Exclude<Caller, 'anonymous'>, AppUser>;
	/** Another member, the target of role changes and removals. */
	targetId: string;
	invitationId: string;
	invitationToken: string;
	vehicleId: string;
	revisionId: string;
	eventId: string;
	runId: string;
	fileId: string;
	planId: string;
	shelfItemId: string;
	shelfReadAt: string;
	seasonId: string;
	purchaseId: string;
	/** A comment written by the member a moment ago. */
	commentId: string;
}

interface Case {
	method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
	params: (w: World) => Record<string, string>;
	body?: (w: World) => unknown;
	query?: (w: World) => string;
	/** A request of its own (multipart uploads); otherwise JSON from `body`. */
	request?: (w: World) => Request | Promise<Request>;
	expect: Expect;
}

const storage = memoryStorage();
const ONE_PIXEL_PNG = Buffer.from(
	'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
	'base64',
);
let currentDb: TestDb['db'] | undefined;
const matrixDb = () => currentDb!;

const teamScoped = (w: World) => ({ teamId: w.teamId });
const read: Expect = { anonymous: 401, viewer: 200, member: 200, captain: 200, outsider: 404 };
const captainOnly = (ok: number): Expect => ({
	anonymous: 401,
	viewer: 403,
	member: 403,
	captain: ok,
	outsider: 404,
});
const memberWrite = (ok: number): Expect => ({
	anonymous: 401,
	viewer: 403,
	member: ok,
	captain: ok,
	outsider: 404,
});
const vehicleScoped = (w: World) => ({ teamId: w.teamId, vehicleId: w.vehicleId });
const revisionScoped = (w: World) => ({
	teamId: w.teamId,
	vehicleId: w.vehicleId,
	revisionId: w.revisionId,
});
const planScoped = (w: World) => ({ teamId: w.teamId, vehicleId: w.vehicleId, planId: w.planId });

const MATRIX: Record<string, Case[]> = {
	'teams/index.ts': [
		{
			method: 'GET',
			params: () => ({}),
			expect: { anonymous: 401, viewer: 200, member: 200, captain: 200, outsider: 200 },
		},
		{
			method: 'POST',
			params: () => ({}),
			body: () => ({ name: 'Another' }),
			expect: { anonymous: 401, viewer: 201, member: 201, captain: 201, outsider: 201 },
		},
	],
	'teams/[teamId]/export.ts': [{ method: 'GET', params: teamScoped, expect: read }],
	// Anyone signed in may restore a backup they hold: it becomes a new team with them as captain.
	'teams/import.ts': [
		{
			method: 'POST',
			params: () => ({}),
			request: async (w) => {
				const form = new FormData();
				form.set(
					'file',
					new Blob([JSON.stringify(await exportTeam(matrixDb(), storage, w.teamId))]),
					'backup.json',
				);
				return new Request('http://localhost/x', { method: 'POST', body: form });
			},
			expect: { anonymous: 401, viewer: 201, member: 201, captain: 201, outsider: 201 },
		},
	],
	'teams/[teamId].ts': [
		{ method: 'GET', params: teamScoped, expect: read },
		{
			method: 'PATCH',
			params: teamScoped,
			body: () => ({ name: 'Renamed' }),
			expect: captainOnly(204),
		},
		{
			method: 'DELETE',
			params: teamScoped,
			body: (w) => ({ confirmName: w.teamName }),
			expect: captainOnly(204),
		},
	],
	'teams/[teamId]/members/index.ts': [{ method: 'GET', params: teamScoped, expect: read }],
	'teams/[teamId]/members/[userId].ts': [
		{
			method: 'PATCH',
			params: (w) => ({ teamId: w.teamId, userId: w.targetId }),
			body: () => ({ role: 'viewer' }),
			expect: captainOnly(204),
		},
		{
			method: 'DELETE',
			params: (w) => ({ teamId: w.teamId, userId: w.targetId }),
			expect: captainOnly(204),
		},
	],
	'teams/[teamId]/invitations/index.ts': [
		{ method: 'GET', params: teamScoped, expect: captainOnly(200) },
		{
			method: 'POST',
			params: teamScoped,
			body: () => ({ email: 'fresh@sagwise.test', role: 'viewer' }),
			expect: captainOnly(201),
		},
	],
	'teams/[teamId]/invitations/[invitationId].ts': [
		{
			method: 'DELETE',
			params: (w) => ({ teamId: w.teamId, invitationId: w.invitationId }),
			expect: captainOnly(204),
		},
	],
	'teams/[teamId]/invitations/[invitationId]/resend.ts': [
		{
			method: 'POST',
			params: (w) => ({ teamId: w.teamId, invitationId: w.invitationId }),
			expect: captainOnly(200),
		},
	],
	'teams/[teamId]/vehicles/index.ts': [
		{ method: 'GET', params: teamScoped, expect: read },
		{
			method: 'POST',
			params: teamScoped,
			body: () => ({ name: 'New car' }),
			expect: memberWrite(201),
		},
	],
	'teams/[teamId]/vehicles/[vehicleId]/index.ts': [
		{ method: 'GET', params: vehicleScoped, expect: read },
		{
			method: 'PATCH',
			params: vehicleScoped,
			body: () => ({ notes: 'Changed' }),
			expect: memberWrite(200),
		},
	],
	'teams/[teamId]/vehicles/[vehicleId]/diff.ts': [
		{
			method: 'GET',
			params: vehicleScoped,
			query: (w) => `?from=${w.revisionId}&to=${w.revisionId}`,
			expect: read,
		},
	],
	'teams/[teamId]/vehicles/[vehicleId]/revisions/index.ts': [
		{ method: 'GET', params: vehicleScoped, expect: read },
		{
			method: 'POST',
			params: vehicleScoped,
			body: (w) => ({ parentId: w.revisionId, message: 'Matrix save', document: pebbleBuild }),
			expect: memberWrite(201),
		},
	],
	'teams/[teamId]/vehicles/[vehicleId]/revisions/[revisionId]/index.ts': [
		{ method: 'GET', params: revisionScoped, expect: read },
	],
	'teams/[teamId]/vehicles/[vehicleId]/revisions/[revisionId]/report.ts': [
		{ method: 'GET', params: revisionScoped, expect: read },
	],
	'teams/[teamId]/vehicles/[vehicleId]/revisions/[revisionId]/spice.ts': [
		{ method: 'GET', params: revisionScoped, expect: read },
	],
	'teams/[teamId]/vehicles/[vehicleId]/revisions/[revisionId]/document.json.ts': [
		{ method: 'GET', params: revisionScoped, expect: read },
	],
	'teams/[teamId]/vehicles/[vehicleId]/revisions/[revisionId]/restore.ts': [
		{
			method: 'POST',
			params: revisionScoped,
			body: (w) => ({ parentId: w.revisionId }),
			expect: memberWrite(201),
		},
	],
	'teams/[teamId]/vehicles/[vehicleId]/plans/index.ts': [
		{ method: 'GET', params: vehicleScoped, expect: read },
		{
			method: 'POST',
			params: vehicleScoped,
			body: () => ({ name: 'Matrix plan' }),
			expect: memberWrite(201),
		},
	],
	'teams/[teamId]/vehicles/[vehicleId]/plans/compare.ts': [
		{ method: 'GET', params: vehicleScoped, query: (w) => `?plans=${w.planId}`, expect: read },
	],
	'teams/[teamId]/vehicles/[vehicleId]/plans/[planId]/index.ts': [
		{ method: 'GET', params: planScoped, expect: read },
		{
			method: 'PUT',
			params: planScoped,
			body: () => ({
				version: 1,
				name: 'Renamed plan',
				notes: '',
				document: pebbleBuild,
				parts: [{ item: 'Fuse', quantity: 1, unitPrice: 12.5 }],
			}),
			expect: memberWrite(200),
		},
		{ method: 'DELETE', params: planScoped, expect: memberWrite(204) },
	],
	'teams/[teamId]/vehicles/[vehicleId]/plans/[planId]/install.ts': [
		{
			method: 'POST',
			params: planScoped,
			body: (w) => ({ parentId: w.revisionId }),
			expect: memberWrite(201),
		},
	],
	'teams/[teamId]/shelf/index.ts': [
		{ method: 'GET', params: teamScoped, expect: read },
		{ method: 'POST', params: teamScoped, body: () => shelfBank(), expect: memberWrite(201) },
	],
	'teams/[teamId]/shelf/[itemId].ts': [
		{
			method: 'PUT',
			params: (w) => ({ teamId: w.teamId, itemId: w.shelfItemId }),
			body: (w) => ({ item: shelfBank({ label: 'Renamed' }), updatedAt: w.shelfReadAt }),
			expect: memberWrite(200),
		},
		{
			method: 'DELETE',
			params: (w) => ({ teamId: w.teamId, itemId: w.shelfItemId }),
			expect: memberWrite(204),
		},
	],
	'teams/[teamId]/shelf/export.csv.ts': [{ method: 'GET', params: teamScoped, expect: read }],
	'teams/[teamId]/shelf/import.ts': [
		{
			method: 'POST',
			params: teamScoped,
			request: () =>
				new Request('http://localhost/x', {
					method: 'POST',
					headers: { 'content-type': 'text/csv' },
					body: 'kind,name,price,currentA\nloads,Fan,12.50,2\n',
				}),
			expect: memberWrite(201),
		},
	],
	'teams/[teamId]/seasons/index.ts': [
		{ method: 'GET', params: teamScoped, expect: read },
		{
			method: 'POST',
			params: teamScoped,
			body: () => ({
				name: 'Next season',
				startsOn: '2027-03-01',
				endsOn: '2027-10-31',
				budgetMinor: 250_000,
			}),
			expect: captainOnly(201),
		},
	],
	'teams/[teamId]/seasons/[seasonId]/index.ts': [
		{ method: 'GET', params: (w) => ({ teamId: w.teamId, seasonId: w.seasonId }), expect: read },
		{
			method: 'DELETE',
			params: (w) => ({ teamId: w.teamId, seasonId: w.seasonId }),
			expect: captainOnly(204),
		},
	],
	'teams/[teamId]/seasons/[seasonId]/purchases/index.ts': [
		{
			method: 'POST',
			params: (w) => ({ teamId: w.teamId, seasonId: w.seasonId }),
			body: (w) => ({
				boughtOn: '2027-04-02',
				item: 'Ring terminals',
				quantity: 20,
				unitPriceMinor: 95,
				paidBy: w.users.member.id,
			}),
			expect: memberWrite(201),
		},
	],
	'teams/[teamId]/seasons/[seasonId]/purchases/[purchaseId].ts': [
		{
			method: 'DELETE',
			params: (w) => ({ teamId: w.teamId, seasonId: w.seasonId, purchaseId: w.purchaseId }),
			expect: memberWrite(204),
		},
	],
	// Viewers read threads; they write only where a captain allows it (off here).
	'teams/[teamId]/comments/index.ts': [
		{
			method: 'GET',
			params: teamScoped,
			query: (w) => `?on=run&id=${w.runId}`,
			expect: read,
		},
		{
			method: 'POST',
			params: teamScoped,
			body: (w) => ({ on: 'plan', id: w.planId, body: 'Why 1/0 here?' }),
			expect: memberWrite(201),
		},
	],
	// A comment is changed by its author only (the member), and deleted by its author or a captain.
	'teams/[teamId]/comments/[commentId].ts': [
		{
			method: 'PATCH',
			params: (w) => ({ teamId: w.teamId, commentId: w.commentId }),
			body: () => ({ body: 'Changed my mind' }),
			expect: { anonymous: 401, viewer: 403, member: 200, captain: 403, outsider: 404 },
		},
		{
			method: 'DELETE',
			params: (w) => ({ teamId: w.teamId, commentId: w.commentId }),
			expect: memberWrite(204),
		},
	],
	'teams/[teamId]/seasons/[seasonId]/purchases/[purchaseId]/receipt.ts': [
		{
			method: 'POST',
			params: (w) => ({ teamId: w.teamId, seasonId: w.seasonId, purchaseId: w.purchaseId }),
			request: () => {
				const form = new FormData();
				form.set('file', new Blob([ONE_PIXEL_PNG]), 'receipt.png');
				return new Request('http://localhost/x', { method: 'POST', body: form });
			},
			expect: memberWrite(201),
		},
		{
			method: 'DELETE',
			params: (w) => ({ teamId: w.teamId, seasonId: w.seasonId, purchaseId: w.purchaseId }),
			expect: memberWrite(204),
		},
	],
	'teams/[teamId]/events/index.ts': [
		{ method: 'GET', params: teamScoped, expect: read },
		{
			method: 'POST',
			params: teamScoped,
			body: () => ({ name: 'Meet', startsOn: '2026-05-01', endsOn: '2026-05-01' }),
			expect: memberWrite(201),
		},
	],
	'teams/[teamId]/events/[eventId]/checks.ts': [
		{
			method: 'GET',
			params: (w) => ({ teamId: w.teamId, eventId: w.eventId }),
			query: (w) => `?vehicleId=${w.vehicleId}`,
			expect: read,
		},
		{
			method: 'POST',
			params: (w) => ({ teamId: w.teamId, eventId: w.eventId }),
			body: (w) => ({ vehicleId: w.vehicleId, itemKey: 'battery_fusing', signed: true }),
			expect: memberWrite(200),
		},
	],
	'teams/[teamId]/check-items/index.ts': [
		{ method: 'GET', params: teamScoped, expect: read },
		{
			method: 'POST',
			params: teamScoped,
			body: () => ({ label: 'Battery hold-downs torqued' }),
			expect: memberWrite(201),
		},
	],
	'teams/[teamId]/events/[eventId]/index.ts': [
		{
			method: 'PATCH',
			params: (w) => ({ teamId: w.teamId, eventId: w.eventId }),
			body: () => ({ place: 'Somewhere' }),
			expect: memberWrite(204),
		},
		{
			method: 'DELETE',
			params: (w) => ({ teamId: w.teamId, eventId: w.eventId }),
			expect: captainOnly(204),
		},
	],
	'teams/[teamId]/runs/index.ts': [
		{ method: 'GET', params: teamScoped, expect: read },
		{
			method: 'POST',
			params: teamScoped,
			body: (w) => ({ vehicleId: w.vehicleId, ranAt: new Date().toISOString(), scoreDb: 140 }),
			expect: memberWrite(201),
		},
	],
	'teams/[teamId]/runs/export.csv.ts': [{ method: 'GET', params: teamScoped, expect: read }],
	'teams/[teamId]/runs/[runId]/index.ts': [
		{ method: 'GET', params: (w) => ({ teamId: w.teamId, runId: w.runId }), expect: read },
		{
			method: 'PATCH',
			params: (w) => ({ teamId: w.teamId, runId: w.runId }),
			body: () => ({ notes: 'Windy' }),
			expect: memberWrite(200),
		},
		{
			method: 'DELETE',
			params: (w) => ({ teamId: w.teamId, runId: w.runId }),
			expect: memberWrite(204),
		},
	],
	'teams/[teamId]/runs/[runId]/photos.ts': [
		{ method: 'GET', params: (w) => ({ teamId: w.teamId, runId: w.runId }), expect: read },
		{
			method: 'POST',
			params: (w) => ({ teamId: w.teamId, runId: w.runId }),
			request: () => {
				const form = new FormData();
				// A 1×1 PNG.
				form.set(
					'file',
					new Blob([
						Buffer.from(
							'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
							'base64',
						),
					]),
					'dot.png',
				);
				return new Request('http://localhost/x', { method: 'POST', body: form });
			},
			expect: memberWrite(201),
		},
	],
	'teams/[teamId]/files/[fileId].ts': [
		{ method: 'GET', params: (w) => ({ teamId: w.teamId, fileId: w.fileId }), expect: read },
	],
	'teams/[teamId]/runs/[runId]/logger.ts': [
		{
			method: 'POST',
			params: (w) => ({ teamId: w.teamId, runId: w.runId }),
			request: () => {
				const form = new FormData();
				form.set('file', new Blob(['time,volts,amps\n0,12.6,0\n1,12.4,100\n']), 'log.csv');
				for (const [k, v] of Object.entries({
					timeColumn: 'time',
					voltsColumn: 'volts',
					ampsColumn: 'amps',
				}))
					form.set(k, v);
				return new Request('http://localhost/x', { method: 'POST', body: form });
			},
			expect: memberWrite(201),
		},
	],
	// Token-based: signed-in people whose address is not the invited one are refused.
	'invitations/[token]/accept.ts': [
		{
			method: 'POST',
			params: (w) => ({ token: w.invitationToken }),
			expect: { anonymous: 401, viewer: 403, member: 403, captain: 403, outsider: 403 },
		},
	],
};

const API_ROOT = path.resolve('src/pages/api');
const SCOPES = ['teams', 'invitations'];

function routeFiles(dir: string): string[] {
	return readdirSync(dir).flatMap((name) => {
		const full = path.join(dir, name);
		return statSync(full).isDirectory()
			? routeFiles(full)
			: name.endsWith('.ts')
				? [path.relative(API_ROOT, full)]
				: [];
	});
}

const modules = import.meta.glob<EndpointModule>(
	'../../src/pages/api/{teams,invitations}/**/*.ts',
	{ eager: true },
);
const moduleFor = (file: string) => modules[`../../src/pages/api/${file}`]!;

describe('authorization matrix', () => {
	let t: TestDb;
	beforeAll(async () => {
		t = await createTestDb();
		currentDb = t.db;
	});
	afterAll(async () => t?.drop());

	async function world(): Promise<World> {
		const teamName = `Matrix ${Math.random().toString(36).slice(2, 8)}`;
		const teamId = await makeTeam(t.db, teamName);
		const users = {
			viewer: await makeUser(t.db),
			member: await makeUser(t.db),
			captain: await makeUser(t.db),
			outsider: await makeUser(t.db),
		};
		await addMember(t.db, teamId, users.viewer, 'viewer');
		await addMember(t.db, teamId, users.member, 'member');
		await addMember(t.db, teamId, users.captain, 'captain');
		const target = await makeUser(t.db);
		await addMember(t.db, teamId, target, 'member');
		const otherTeam = await makeTeam(t.db, 'Elsewhere');
		await addMember(t.db, otherTeam, users.outsider, 'captain');
		const invitationToken = `tok${Math.random().toString(36).slice(2)}${'x'.repeat(30)}`;
		const inv = await t.db
			.insertInto('invitation')
			.values({
				team_id: teamId,
				email: 'pending@sagwise.test',
				role: 'member',
				token_hash: hashToken(invitationToken),
				expires_at: new Date(Date.now() + 86_400_000),
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const { vehicle, buildId } = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Matrix car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		const saved = await appendRevision(t.db, {
			buildId,
			parentId: null,
			document: pebbleBuild,
			message: 'Seed',
			authorId: users.member.id,
		});
		if (!saved.ok) throw new Error('seed revision');
		const ev = await t.db
			.insertInto('event')
			.values({
				team_id: teamId,
				name: 'Matrix meet',
				starts_on: new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10),
				ends_on: new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10),
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const run = await t.db
			.insertInto('run')
			.values({
				vehicle_id: vehicle.id,
				event_id: ev.id,
				revision_id: saved.revision.id,
				ran_at: new Date(),
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const file = await t.db
			.insertInto('stored_file')
			.values({
				team_id: teamId,
				run_id: run.id,
				kind: 'logger',
				object_key: `matrix/${run.id}.csv`,
				file_name: 'log.csv',
				content_type: 'text/csv',
				size_bytes: 4,
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await storage.put(`matrix/${run.id}.csv`, new TextEncoder().encode('t,v\n'), 'text/csv');
		const planId = await insertPlan(t.db, {
			vehicleId: vehicle.id,
			name: 'Matrix plan',
			notes: '',
			baseRevisionId: saved.revision.id,
			document: pebbleBuild,
			createdBy: users.member.id,
		});
		const [shelfItem] = await insertShelfItems(t.db, teamId, [shelfBank()]);
		const seasonId = await insertSeason(t.db, teamId, {
			name: 'Matrix season',
			startsOn: '2027-03-01',
			endsOn: '2027-10-31',
			budgetMinor: 100_000,
		});
		const purchaseId = await insertPurchase(t.db, seasonId, {
			boughtOn: '2027-03-05',
			shelfItemId: null,
			item: 'Fuse holder',
			quantity: 1,
			unitPriceMinor: 3_450,
			paidBy: users.captain.id,
			paidByName: 'Captain',
			notes: '',
			createdBy: users.captain.id,
		});
		await t.db
			.insertInto('stored_file')
			.values({
				team_id: teamId,
				purchase_id: purchaseId,
				kind: 'receipt',
				object_key: `matrix/receipt-${purchaseId}.png`,
				file_name: 'receipt.png',
				content_type: 'image/png',
				size_bytes: ONE_PIXEL_PNG.byteLength,
			})
			.execute();
		await storage.put(`matrix/receipt-${purchaseId}.png`, ONE_PIXEL_PNG, 'image/png');
		const comment = await t.db
			.insertInto('comment')
			.values({
				team_id: teamId,
				run_id: run.id,
				author_id: users.member.id,
				body: 'Rear bank warm',
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		return {
			commentId: comment.id,
			seasonId,
			purchaseId,
			shelfItemId: shelfItem!.id,
			shelfReadAt: shelfItem!.updatedAt,
			teamId,
			teamName,
			users,
			targetId: target.id,
			invitationId: inv.id,
			invitationToken,
			vehicleId: vehicle.id,
			revisionId: saved.revision.id,
			eventId: ev.id,
			runId: run.id,
			fileId: file.id,
			planId,
		};
	}

	it('has an entry for every route file and every exported method', () => {
		const files = SCOPES.flatMap((s) => routeFiles(path.join(API_ROOT, s)));
		expect(files.length).toBeGreaterThan(5);
		for (const file of files) {
			expect(MATRIX[file], `no authorization entry for ${file}`).toBeDefined();
			const exported = Object.keys(moduleFor(file))
				.filter((k) => ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'].includes(k))
				.sort();
			expect(MATRIX[file]!.map((c) => c.method).sort(), `methods of ${file}`).toEqual(exported);
		}
	});

	const rows = Object.entries(MATRIX).flatMap(([file, cases]) =>
		cases.flatMap((c) =>
			(Object.keys(c.expect) as Caller[]).map((caller) => [file, c.method, caller, c] as const),
		),
	);

	it.each(rows)('%s %s as %s', async (file, method, caller, c) => {
		const w = await world();
		const user = caller === 'anonymous' ? null : w.users[caller];
		const res = await callEndpoint(moduleFor(file), {
			locals: localsFor(t.db, user, undefined, storage),
			params: c.params(w),
			request:
				(await c.request?.(w)) ??
				jsonRequest(
					`/x${c.query?.(w) ?? ''}`,
					method,
					c.body?.(w) ?? (method === 'GET' ? undefined : {}),
				),
		});
		expect(res.status).toBe(c.expect[caller]);
		if (res.status >= 400) expect(res.headers.get('content-type')).toBe('application/problem+json');
	});
});
