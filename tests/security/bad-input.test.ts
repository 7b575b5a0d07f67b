import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import type { AppUser } from '../../src/lib/server/auth';
import { appendRevision } from '../../src/lib/server/db/builds';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import { insertPlan } from '../../src/lib/server/db/plans';
import * as preferences from '../../src/pages/api/account/preferences';
import * as comments from '../../src/pages/api/teams/[teamId]/comments/index';
import * as comment from '../../src/pages/api/teams/[teamId]/comments/[commentId]';
import * as markRead from '../../src/pages/api/notifications/read';
import * as passwordReset from '../../src/pages/api/account/password-reset';
import * as signUp from '../../src/pages/api/account/sign-up';
import * as team from '../../src/pages/api/teams/[teamId]';
import * as checkItems from '../../src/pages/api/teams/[teamId]/check-items/index';
import * as checks from '../../src/pages/api/teams/[teamId]/events/[eventId]/checks';
import * as event from '../../src/pages/api/teams/[teamId]/events/[eventId]/index';
import * as events from '../../src/pages/api/teams/[teamId]/events/index';
import * as invitations from '../../src/pages/api/teams/[teamId]/invitations/index';
import * as run from '../../src/pages/api/teams/[teamId]/runs/[runId]/index';
import * as runs from '../../src/pages/api/teams/[teamId]/runs/index';
import * as vehicle from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/index';
import * as plan from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/plans/[planId]/index';
import * as plans from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/plans/index';
import * as revisions from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/revisions/index';
import * as vehicles from '../../src/pages/api/teams/[teamId]/vehicles/index';
import * as teams from '../../src/pages/api/teams/index';
import * as shelf from '../../src/pages/api/teams/[teamId]/shelf/index';
import * as seasons from '../../src/pages/api/teams/[teamId]/seasons/index';
import * as purchases from '../../src/pages/api/teams/[teamId]/seasons/[seasonId]/purchases/index';
import { insertSeason } from '../../src/lib/server/db/seasons';
import { shelfBank } from '../helpers/shelf';
import { callEndpoint, type EndpointModule } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

type Json = Record<string, unknown>;
interface Route {
	name: string;
	module: EndpointModule;
	method: 'POST' | 'PUT' | 'PATCH';
	params: () => Record<string, string>;
	/** A body the route accepts. */
	valid: () => Json;
	/** Dotted paths of text fields: one-line names, and free text that may hold line breaks. */
	lines: string[];
	notes: string[];
	numbers: string[];
	required: string[];
}

const TABLES = [
	'team',
	'membership',
	'vehicle',
	'build',
	'revision',
	'event',
	'run',
	'check_item',
	'check_signoff',
	'plan',
	'plan_part',
	'invitation',
	'shelf_item',
	'season',
	'purchase',
	'comment',
	'notification',
	'User',
] as const;

function setPath(obj: Json, path: string, value: unknown): Json {
	const copy = structuredClone(obj);
	const keys = path.split('.');
	let at: any = copy;
	for (const k of keys.slice(0, -1)) at = at[k];
	if (value === undefined) delete at[keys.at(-1)!];
	else at[keys.at(-1)!] = value;
	return copy;
}

/**
 * Every write route against hostile bodies: control characters, line breaks in names, 100,000
 * characters, wrong types, numbers out of range, NaN and Infinity (not JSON at all), missing
 * fields. Each answers 4xx problem+json naming the field, and no table changes.
 */
describe('bad input on every write route', () => {
	let t: TestDb;
	let captain: AppUser;
	const ids: Record<string, string> = {};

	beforeAll(async () => {
		t = await createTestDb();
		captain = await makeUser(t.db, 'corpus.captain@sagwise.test', 'Corpus Captain');
		ids.teamId = await makeTeam(t.db, 'Corpus Team');
		await addMember(t.db, ids.teamId, captain, 'captain');
		const v = await insertVehicleWithBuild(t.db, {
			teamId: ids.teamId,
			name: 'Corpus car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		ids.vehicleId = v.vehicle.id;
		const r = await appendRevision(t.db, {
			buildId: v.buildId,
			parentId: null,
			document: pebbleBuild,
			message: 'First',
			authorId: captain.id,
		});
		if (!r.ok) throw new Error('revision');
		ids.revisionId = r.revision.id;
		ids.eventId = (
			await t.db
				.insertInto('event')
				.values({
					team_id: ids.teamId,
					name: 'Corpus meet',
					starts_on: '2027-01-10',
					ends_on: '2027-01-10',
				})
				.returning('id')
				.executeTakeFirstOrThrow()
		).id;
		ids.runId = (
			await t.db
				.insertInto('run')
				.values({ vehicle_id: ids.vehicleId, ran_at: new Date(), notes: '' })
				.returning('id')
				.executeTakeFirstOrThrow()
		).id;
		ids.planId = await insertPlan(t.db, {
			vehicleId: ids.vehicleId,
			name: 'Corpus plan',
			notes: '',
			baseRevisionId: ids.revisionId,
			document: pebbleBuild,
			createdBy: captain.id,
		});
	});
	beforeAll(async () => {
		ids.commentId = (
			await t.db
				.insertInto('comment')
				.values({ team_id: ids.teamId, plan_id: ids.planId, author_id: captain.id, body: 'First' })
				.returning('id')
				.executeTakeFirstOrThrow()
		).id;
	});
	beforeAll(async () => {
		// No budget: the team has no money recorded, so its currency may still change.
		ids.seasonId = await insertSeason(t.db, ids.teamId, {
			name: 'Corpus season',
			startsOn: '2027-01-01',
			endsOn: '2027-12-31',
			budgetMinor: 0,
		});
	});
	afterAll(async () => t?.drop());

	const team_ = () => ({ teamId: ids.teamId });
	const veh = () => ({ teamId: ids.teamId, vehicleId: ids.vehicleId });
	const routes: Route[] = [
		{
			name: 'shelf entry',
			module: shelf,
			method: 'POST',
			params: team_,
			valid: () => shelfBank(),
			lines: ['label', 'supplier', 'link'],
			notes: ['notes'],
			numbers: ['priceMinor', 'owned', 'spec.unitCapacityAh', 'spec.unitResistanceOhm'],
			required: ['label', 'kind', 'spec'],
		},
		{
			name: 'new season',
			module: seasons,
			method: 'POST',
			params: team_,
			valid: () => ({
				name: '2027',
				startsOn: '2027-03-01',
				endsOn: '2027-10-31',
				budgetMinor: 150_000,
			}),
			lines: ['name'],
			notes: [],
			numbers: ['budgetMinor'],
			required: ['name', 'startsOn', 'endsOn', 'budgetMinor'],
		},
		{
			name: 'purchase',
			module: purchases,
			method: 'POST',
			params: () => ({ teamId: ids.teamId, seasonId: ids.seasonId! }),
			valid: () => ({
				boughtOn: '2027-04-02',
				item: 'Ring terminals',
				quantity: 2,
				unitPriceMinor: 95,
				paidBy: captain.id,
				notes: 'For the rear bank',
			}),
			lines: ['item'],
			notes: ['notes'],
			numbers: ['quantity', 'unitPriceMinor'],
			required: ['item', 'boughtOn', 'paidBy', 'quantity', 'unitPriceMinor'],
		},
		{
			name: 'comment',
			module: comments,
			method: 'POST',
			params: team_,
			valid: () => ({
				on: 'revision',
				id: ids.revisionId,
				body: 'Why 1/0 here?\nAsk @Corpus Captain',
			}),
			lines: [],
			notes: ['body'],
			numbers: [],
			required: ['on', 'id', 'body'],
		},
		{
			name: 'comment change',
			module: comment,
			method: 'PATCH',
			params: () => ({ teamId: ids.teamId, commentId: ids.commentId! }),
			valid: () => ({ body: 'Changed\nmy mind' }),
			lines: [],
			notes: ['body'],
			numbers: [],
			required: ['body'],
		},
		{
			name: 'notifications read',
			module: markRead,
			method: 'POST',
			params: () => ({}),
			valid: () => ({ all: true }),
			lines: [],
			notes: [],
			numbers: [],
			required: ['all'],
		},
		{
			name: 'new team',
			module: teams,
			method: 'POST',
			params: () => ({}),
			valid: () => ({ name: 'Fine team' }),
			lines: ['name'],
			notes: [],
			numbers: [],
			required: ['name'],
		},
		{
			name: 'team settings',
			module: team,
			method: 'PATCH',
			params: team_,
			valid: () => ({ name: 'Fine team', reminderDays: 3, currency: 'EUR' }),
			lines: ['name'],
			notes: [],
			numbers: ['reminderDays'],
			required: [],
		},
		{
			name: 'new vehicle',
			module: vehicles,
			method: 'POST',
			params: team_,
			valid: () => ({ name: 'Car', description: 'd', competitionClass: 'c', notes: 'n' }),
			lines: ['name', 'description', 'competitionClass'],
			notes: ['notes'],
			numbers: [],
			required: ['name'],
		},
		{
			name: 'vehicle details',
			module: vehicle,
			method: 'PATCH',
			params: veh,
			valid: () => ({ name: 'Car', notes: 'n' }),
			lines: ['name'],
			notes: ['notes'],
			numbers: [],
			required: [],
		},
		{
			name: 'new revision',
			module: revisions,
			method: 'POST',
			params: veh,
			valid: () => ({
				parentId: ids.revisionId,
				message: 'Bigger ground',
				document: structuredClone(pebbleBuild),
			}),
			lines: ['document.nodes.0.label', 'document.cables.0.label', 'document.cables.0.id'],
			notes: ['message'],
			numbers: ['document.cables.0.lengthM', 'document.cables.0.parallelRuns'],
			required: ['message', 'document'],
		},
		{
			name: 'new event',
			module: events,
			method: 'POST',
			params: team_,
			valid: () => ({
				name: 'Meet',
				startsOn: '2027-02-01',
				endsOn: '2027-02-02',
				place: 'p',
				format: 'f',
				notes: 'n',
			}),
			lines: ['name', 'place', 'format'],
			notes: ['notes'],
			numbers: [],
			required: ['name', 'startsOn'],
		},
		{
			name: 'event details',
			module: event,
			method: 'PATCH',
			params: () => ({ ...team_(), eventId: ids.eventId }),
			valid: () => ({ name: 'Meet', notes: 'n' }),
			lines: ['name'],
			notes: ['notes'],
			numbers: [],
			required: [],
		},
		{
			name: 'new run',
			module: runs,
			method: 'POST',
			params: team_,
			valid: () => ({
				vehicleId: ids.vehicleId,
				ranAt: new Date().toISOString(),
				scoreDb: 140.2,
				minV: 12.1,
				notes: 'n',
			}),
			lines: [],
			notes: ['notes'],
			numbers: ['scoreDb', 'minV'],
			required: ['vehicleId', 'ranAt'],
		},
		{
			name: 'run details',
			module: run,
			method: 'PATCH',
			params: () => ({ ...team_(), runId: ids.runId }),
			valid: () => ({ scoreDb: 141, notes: 'n' }),
			lines: [],
			notes: ['notes'],
			numbers: ['scoreDb'],
			required: [],
		},
		{
			name: 'manual check item',
			module: checkItems,
			method: 'POST',
			params: team_,
			valid: () => ({ label: 'Battery hold-downs' }),
			lines: ['label'],
			notes: [],
			numbers: [],
			required: ['label'],
		},
		{
			name: 'check sign-off',
			module: checks,
			method: 'POST',
			params: () => ({ ...team_(), eventId: ids.eventId }),
			valid: () => ({
				vehicleId: ids.vehicleId,
				itemKey: 'battery_fusing',
				note: 'ok',
				signed: true,
			}),
			lines: ['itemKey'],
			notes: ['note'],
			numbers: [],
			required: ['vehicleId', 'signed'],
		},
		{
			name: 'new plan',
			module: plans,
			method: 'POST',
			params: veh,
			valid: () => ({ name: 'Plan', notes: 'n' }),
			lines: ['name'],
			notes: ['notes'],
			numbers: [],
			required: ['name'],
		},
		{
			name: 'plan save',
			module: plan,
			method: 'PUT',
			params: () => ({ ...veh(), planId: ids.planId }),
			valid: () => ({
				version: 1,
				name: 'Plan',
				notes: 'n',
				document: structuredClone(pebbleBuild),
				parts: [{ item: 'Fuse', quantity: 2, unitPrice: 9.5, link: '' }],
			}),
			lines: ['name', 'parts.0.item', 'parts.0.link'],
			notes: ['notes'],
			numbers: ['parts.0.quantity', 'parts.0.unitPrice', 'version'],
			required: ['version', 'document'],
		},
		{
			name: 'invitation',
			module: invitations,
			method: 'POST',
			params: team_,
			valid: () => ({ email: 'fresh.corpus@sagwise.test', role: 'member' }),
			lines: ['email'],
			notes: [],
			numbers: [],
			required: ['email', 'role'],
		},
		{
			name: 'sign-up',
			module: signUp,
			method: 'POST',
			params: () => ({}),
			valid: () => ({
				name: 'New Person',
				email: 'corpus.new@sagwise.test',
				password: 'long enough password',
			}),
			lines: ['name', 'email'],
			notes: [],
			numbers: [],
			required: ['name', 'email', 'password'],
		},
		{
			name: 'password reset',
			module: passwordReset,
			method: 'POST',
			params: () => ({}),
			valid: () => ({ email: 'corpus.captain@sagwise.test' }),
			lines: ['email'],
			notes: [],
			numbers: [],
			required: ['email'],
		},
		{
			name: 'preferences',
			module: preferences,
			method: 'PATCH',
			params: () => ({}),
			valid: () => ({ unitSystem: 'metric' }),
			lines: ['unitSystem'],
			notes: [],
			numbers: [],
			required: ['unitSystem'],
		},
	];

	const counts = async () => {
		const out: Record<string, number> = {};
		for (const table of TABLES)
			out[table] = Number(
				(await sql<{ n: string }>`select count(*) as n from ${sql.table(table)}`.execute(t.db))
					.rows[0]!.n,
			);
		return out;
	};
	const send = (r: Route, raw: string) =>
		callEndpoint(r.module, {
			locals: localsFor(t.db, captain),
			params: r.params(),
			request: new Request('http://localhost/x', {
				method: r.method,
				headers: { 'content-type': 'application/json' },
				body: raw,
			}),
		});

	const hostileText = [
		'bad\u0000nul',
		'bell\u0007here',
		'esc\u001b[2Jhere',
		'del\u007fhere',
		'x'.repeat(100_000),
	];
	const hostileLine = ['line\nbreak', 'carriage\rreturn', 'sep\u2028line'];
	const hostileNumber = ['12', 1e308, -1e308, true, [], {}];

	for (const r of routes) {
		it(`${r.name}: refuses every hostile field with 4xx problem+json naming it, and writes nothing`, async () => {
			const cases: { label: string; body: string; field?: string }[] = [];
			for (const f of [...r.lines, ...r.notes])
				for (const v of hostileText)
					cases.push({
						label: `${f}=${JSON.stringify(v).slice(0, 20)}`,
						body: JSON.stringify(setPath(r.valid(), f, v)),
						field: f,
					});
			for (const f of r.lines)
				for (const v of hostileLine)
					cases.push({
						label: `${f}=${JSON.stringify(v)}`,
						body: JSON.stringify(setPath(r.valid(), f, v)),
						field: f,
					});
			for (const f of [...r.lines, ...r.notes])
				cases.push({
					label: `${f}=number`,
					body: JSON.stringify(setPath(r.valid(), f, 42)),
					field: f,
				});
			for (const f of r.numbers)
				for (const v of hostileNumber)
					cases.push({
						label: `${f}=${JSON.stringify(v)}`,
						body: JSON.stringify(setPath(r.valid(), f, v)),
						field: f,
					});
			for (const f of r.numbers)
				for (const v of ['NaN', 'Infinity', '-Infinity'])
					cases.push({
						label: `${f}=${v}`,
						body: JSON.stringify(setPath(r.valid(), f, '__RAW__')).replace('"__RAW__"', v),
					});
			for (const f of r.required)
				cases.push({
					label: `without ${f}`,
					body: JSON.stringify(setPath(r.valid(), f, undefined)),
					field: f,
				});
			cases.push(
				{ label: 'not an object', body: '"just a string"' },
				{ label: 'cut short', body: JSON.stringify(r.valid()).slice(0, 10) },
			);

			const before = await counts();
			for (const c of cases) {
				const res = await send(r, c.body);
				expect(res.status, c.label).toBeGreaterThanOrEqual(400);
				expect(res.status, c.label).toBeLessThan(500);
				expect(res.headers.get('content-type'), c.label).toBe('application/problem+json');
				const problem = (await res.json()) as { errors?: { path: string }[] };
				if (c.field) expect(problem.errors?.map((e) => e.path) ?? [], c.label).toContain(c.field);
			}
			expect(await counts()).toEqual(before);
		});
	}

	it('still takes line breaks in notes and messages', async () => {
		const res = await send(
			routes.find((r) => r.name === 'new event')!,
			JSON.stringify({
				name: 'Meet',
				startsOn: '2027-02-01',
				endsOn: '2027-02-01',
				notes: 'Lane 3\nthen lane 5\r\n\twith tabs',
			}),
		);
		expect(res.status).toBe(201);
		expect((await res.json()).notes).toBe('Lane 3\nthen lane 5\r\n\twith tabs');
	});
});
