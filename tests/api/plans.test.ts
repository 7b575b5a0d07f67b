import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { marlinBuild } from '../../db/demo/builds';
import { comparePlans } from '../../src/engine/compare';
import { diffBuilds } from '../../src/engine/diff';
import type { BuildDocument } from '../../src/engine/types';
import type { AppUser } from '../../src/lib/server/auth';
import { appendRevision, findHeadRevision } from '../../src/lib/server/db/builds';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import * as plans from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/plans/index';
import * as compare from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/plans/compare';
import * as plan from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/plans/[planId]/index';
import * as install from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/plans/[planId]/install';
import * as revisions from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/revisions/index';
import { callEndpoint, type EndpointModule, jsonRequest } from '../helpers/container';
import { withUnfusedBank } from '../helpers/networks';
import { addMember, localsFor, makeTeam, makeUser } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

/** A plan that upsizes the alternator run and adds a parts list. */
function upsized(doc: BuildDocument): BuildDocument {
	const next = structuredClone(doc);
	const run = next.cables.find((c) => c.id === 'run')!;
	run.size = { kind: 'awg', awg: '4/0' };
	return next;
}

describe('upgrade plans', () => {
	let t: TestDb;
	let teamId: string;
	let vehicleId: string;
	let buildId: string;
	let member: AppUser;
	beforeAll(async () => {
		t = await createTestDb();
		teamId = await makeTeam(t.db, 'Plan Team');
		member = await makeUser(t.db, 'planner@sagwise.test', 'Planner');
		await addMember(t.db, teamId, member, 'member');
		const v = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Plan car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		vehicleId = v.vehicle.id;
		buildId = v.buildId;
		await appendRevision(t.db, {
			buildId,
			parentId: null,
			document: marlinBuild,
			message: 'As built',
			authorId: member.id,
		});
	});
	afterAll(async () => t?.drop());

	const call = (
		module: EndpointModule,
		method: string,
		params: Record<string, string> = {},
		body?: unknown,
		query = '',
	) =>
		callEndpoint(module, {
			locals: localsFor(t.db, member),
			params: { teamId, vehicleId, ...params },
			request: jsonRequest(`/x${query}`, method, body),
		});

	async function newPlan(
		name: string,
		change: (d: BuildDocument) => BuildDocument,
		parts: unknown[],
	) {
		const created = await call(plans, 'POST', {}, { name });
		expect(created.status).toBe(201);
		const p = await created.json();
		const saved = await call(
			plan,
			'PUT',
			{ planId: p.id },
			{ version: p.version, name, notes: '', document: change(p.document), parts },
		);
		expect(saved.status).toBe(200);
		return saved.json();
	}

	it('starts from the head, keeps the parts list and totals it exactly in minor units', async () => {
		const p = await newPlan('Bigger run', upsized, [
			{ item: '4/0 OFC, per foot', quantity: 17, unitPrice: 4.35, link: 'catalogue page 12' },
			{ item: 'Lugs', quantity: 4, unitPrice: 3.1 },
		]);
		expect(p.baseRevisionNumber).toBe(1);
		expect(p.parts).toHaveLength(2);
		// 17 × 4.35 + 4 × 3.10 = 73.95 + 12.40 = 86.35 (worked by hand).
		expect(p.total).toBe(86.35);
		expect(p.partCount).toBe(2);
		const list = await (await call(plans, 'GET')).json();
		expect(list.map((x: { name: string }) => x.name)).toContain('Bigger run');
	});

	it('starts a plan with a document of its own (a calibration’s fitted values) and refuses one that cannot solve', async () => {
		const fitted = structuredClone(marlinBuild);
		fitted.cables.find((c) => c.id === 'block_feed')!.connectionResistanceOhm = 0.0015;
		const created = await call(
			plans,
			'POST',
			{},
			{ name: 'Fitted to a run', document: fitted, notes: 'joint 1.50 mΩ' },
		);
		expect(created.status).toBe(201);
		const p = await created.json();
		expect(p.baseRevisionNumber).toBe(1);
		expect(
			p.document.cables.find((c: { id: string }) => c.id === 'block_feed').connectionResistanceOhm,
		).toBe(0.0015);
		// The build's head is untouched.
		const head = await findHeadRevision(t.db, buildId);
		expect(
			head!.document.cables.find((c) => c.id === 'block_feed')!.connectionResistanceOhm,
		).toBeUndefined();

		const island = structuredClone(marlinBuild);
		island.cables = island.cables.filter((c) => c.id !== 'block_feed');
		const refused = await call(plans, 'POST', {}, { name: 'Broken', document: island });
		expect(refused.status).toBe(400);
		const negative = structuredClone(marlinBuild);
		negative.cables[0]!.connectionResistanceOhm = -1;
		const bad = await call(plans, 'POST', {}, { name: 'Negative', document: negative });
		expect(bad.status).toBe(400);
		expect(JSON.stringify(await bad.json())).toContain('connectionResistanceOhm');
	});

	it('refuses a save on top of a newer version with 409, keeping both', async () => {
		const created = await (await call(plans, 'POST', {}, { name: 'Race' })).json();
		const body = {
			version: created.version,
			name: 'Race',
			notes: 'first',
			document: created.document,
			parts: [],
		};
		expect((await call(plan, 'PUT', { planId: created.id }, body)).status).toBe(200);
		const stale = await call(plan, 'PUT', { planId: created.id }, { ...body, notes: 'second' });
		expect(stale.status).toBe(409);
		const problem = await stale.json();
		expect(problem.current.notes).toBe('first');
		expect(problem.yours.notes).toBe('second');
	});

	it('answers field errors for a bad parts line and writes nothing', async () => {
		const created = await (await call(plans, 'POST', {}, { name: 'Bad parts' })).json();
		const res = await call(
			plan,
			'PUT',
			{ planId: created.id },
			{
				version: 1,
				name: 'Bad parts',
				notes: '',
				document: created.document,
				parts: [{ item: 'Fuse', quantity: 0, unitPrice: 1.234 }],
			},
		);
		expect(res.status).toBe(400);
		const paths = (await res.json()).errors.map((e: { path: string }) => e.path);
		expect(paths).toEqual(expect.arrayContaining(['parts.0.quantity', 'parts.0.unitPrice']));
		expect((await (await call(plan, 'GET', { planId: created.id })).json()).version).toBe(1);
	});

	it('compares the head and the plans with the numbers of the engine run on each document', async () => {
		const list = await (await call(plans, 'GET')).json();
		const bigger = list.find((x: { name: string }) => x.name === 'Bigger run');
		const res = await call(compare, 'GET', {}, undefined, `?plans=${bigger.id}`);
		expect(res.status).toBe(200);
		const body = await res.json();
		const expected = comparePlans(marlinBuild, [
			{ id: bigger.id, name: 'Bigger run', document: upsized(marlinBuild), cost: 86.35 },
		]);
		expect(body.columns).toEqual(JSON.parse(JSON.stringify(expected)));
		expect(body.columns[1].deltaDb).toBeGreaterThan(0);
		expect(
			(
				await call(
					compare,
					'GET',
					{},
					undefined,
					`?plans=${[bigger.id, bigger.id, bigger.id, bigger.id].join(',')}`,
				)
			).status,
		).toBe(400);
		const unknown = await call(
			compare,
			'GET',
			{},
			undefined,
			`?plans=${bigger.id},00000000-0000-4000-8000-000000000000`,
		);
		expect(unknown.status).toBe(404);
		expect((await unknown.json()).errors[0].path).toBe('plans');
	});

	it('recomputes a cached comparison when a plan is saved again (its version is part of the key)', async () => {
		const created = await (await call(plans, 'POST', {}, { name: 'Cache check' })).json();
		const first = await call(compare, 'GET', {}, undefined, `?plans=${created.id}`);
		const etag = first.headers.get('etag')!;
		expect((await first.json()).columns[1].cost).toBe(0);
		const saved = await call(
			plan,
			'PUT',
			{ planId: created.id },
			{
				version: created.version,
				name: 'Cache check',
				notes: '',
				document: upsized(created.document),
				parts: [{ item: 'Lugs', quantity: 2, unitPrice: 5 }],
			},
		);
		expect(saved.status).toBe(200);
		const after = await call(compare, 'GET', {}, undefined, `?plans=${created.id}`);
		expect(after.headers.get('etag')).not.toBe(etag);
		const body = await after.json();
		expect(body.columns[1].cost).toBe(10);
		expect(body.columns[1].deltaDb).toBeGreaterThan(0);
	});

	it('installs a plan as the next revision with its changes and a message naming it', async () => {
		const list = await (await call(plans, 'GET')).json();
		const bigger = list.find((x: { name: string }) => x.name === 'Bigger run');
		const before = (await findHeadRevision(t.db, buildId))!;
		// Someone else's save first: the install naming the old head is refused and writes nothing.
		const other = await call(
			revisions,
			'POST',
			{},
			{
				parentId: before.id,
				message: 'Loads tidied',
				document: { ...marlinBuild, loads: [{ ...marlinBuild.loads[0]!, currentA: 30 }] },
			},
		);
		expect(other.status).toBe(201);
		const head = (await findHeadRevision(t.db, buildId))!;
		const refused = await call(install, 'POST', { planId: bigger.id }, { parentId: before.id });
		expect(refused.status).toBe(409);
		expect((await refused.json()).head.number).toBe(head.number);
		expect((await findHeadRevision(t.db, buildId))!.id).toBe(head.id);

		const res = await call(install, 'POST', { planId: bigger.id }, { parentId: head.id });
		expect(res.status).toBe(201);
		const revision = await res.json();
		expect(revision.number).toBe(head.number + 1);
		expect(revision.message).toBe('Installed plan “Bigger run”');
		// The plan started from revision 1: its one change (the run's size) goes on top of the head,
		// and the head's own change since (the loads) is kept.
		expect(diffBuilds(head.document, revision.document)).toEqual([
			{
				group: 'cables',
				id: 'run',
				label: 'Front-to-rear run',
				kind: 'changed',
				fields: [{ field: 'size.awg', before: '1/0', after: '4/0' }],
			},
		]);
		expect(revision.document.loads[0].currentA).toBe(30);
		const after = await (await call(plan, 'GET', { planId: bigger.id })).json();
		expect(after.installedRevisionNumber).toBe(revision.number);
	});

	it('refuses to install a plan whose part the head changed differently, naming it, and writes nothing', async () => {
		const p = await newPlan(
			'Heavier loads',
			(d) => ({ ...d, loads: [{ ...d.loads[0]!, currentA: 45 }] }),
			[],
		);
		const head = (await findHeadRevision(t.db, buildId))!;
		const next = await call(
			revisions,
			'POST',
			{},
			{
				parentId: head.id,
				message: 'Loads measured',
				document: { ...head.document, loads: [{ ...head.document.loads[0]!, currentA: 33 }] },
			},
		);
		const now = await next.json();
		const res = await call(install, 'POST', { planId: p.id }, { parentId: now.id });
		expect(res.status).toBe(409);
		const body = await res.json();
		expect(body.detail).toMatch(/Vehicle electrics/);
		expect(body.errors).toEqual([
			{
				path: 'loads.vehicle',
				message: expect.stringMatching(/changed in the plan, changed in revision/),
			},
		]);
		expect((await findHeadRevision(t.db, buildId))!.id).toBe(now.id);
	});

	it('refuses an install whose merge breaks a schema limit, naming the rule, and writes nothing', async () => {
		// Two plans from the same revision each add four alternators beside the one the build has:
		// each alone gives 5 (the schema allows 8); merged one after the other they would give 9.
		const withAlternators = (prefix: string) => (d: BuildDocument) => ({
			...d,
			alternators: [
				...d.alternators,
				...[1, 2, 3, 4].map((k) => ({
					...d.alternators[0]!,
					id: `${prefix}${k}`,
					label: `${prefix}${k}`,
				})),
			],
		});
		const first = await newPlan('Four more', withAlternators('x'), []);
		const second = await newPlan('Four others', withAlternators('y'), []);
		const head = (await findHeadRevision(t.db, buildId))!;
		// Five alternators overload the charge lead: that danger is named and accepted first.
		const asked = await call(install, 'POST', { planId: first.id }, { parentId: head.id });
		expect(asked.status).toBe(409);
		const keys = (await asked.json()).findings.map((f: { key: string }) => f.key);
		const one = await call(
			install,
			'POST',
			{ planId: first.id },
			{ parentId: head.id, acceptDangers: keys },
		);
		expect(one.status).toBe(201);
		const now = await one.json();
		expect(now.document.alternators).toHaveLength(5);
		const two = await call(install, 'POST', { planId: second.id }, { parentId: now.id });
		expect(two.status).toBe(422);
		const body = await two.json();
		expect(body.code).toBe('invalid_merge');
		expect(body.detail).toMatch(/At most 8 alternators/);
		expect(body.errors).toContainEqual({
			path: 'document.alternators',
			message: 'At most 8 alternators',
		});
		expect((await findHeadRevision(t.db, buildId))!.id).toBe(now.id);
	});

	it('names a danger finding a plan brings, never marks it best value, and installs it only once confirmed', async () => {
		const p = await newPlan('Unfused extra bank', withUnfusedBank, [
			{ item: 'AGM battery', quantity: 1, unitPrice: 10 },
		]);
		const cmp = await call(compare, 'GET', {}, undefined, `?plans=${p.id}`);
		expect(cmp.status).toBe(200);
		const columns = (await cmp.json()).columns;
		const col = columns[1];
		expect(col.addedDangers.length).toBeGreaterThan(0);
		expect(col.addedDangers.map((d: { message: string }) => d.message).join(' ')).toMatch(
			/Extra bank link/,
		);
		expect(col.findings.danger).toBe(columns[0].findings.danger + col.addedDangers.length);

		const head = (await findHeadRevision(t.db, buildId))!;
		const unconfirmed = await call(install, 'POST', { planId: p.id }, { parentId: head.id });
		expect(unconfirmed.status).toBe(409);
		const body = await unconfirmed.json();
		expect(body.code).toBe('confirm_findings');
		expect(body.detail).toMatch(/Extra bank link/);
		expect((await findHeadRevision(t.db, buildId))!.id).toBe(head.id);
		const confirmed = await call(
			install,
			'POST',
			{ planId: p.id },
			{ parentId: head.id, acceptDangers: body.findings.map((f: { key: string }) => f.key) },
		);
		expect(confirmed.status).toBe(201);
	});

	it('refuses a hostile list of accepted findings before anything is computed or saved', async () => {
		const head = (await findHeadRevision(t.db, buildId))!;
		const p = await newPlan('Hostile accept', upsized, []);
		for (const acceptDangers of [
			['over_capacity|cable|run\u0000'],
			Array.from({ length: 501 }, (_, i) => `k${i}`),
			'not a list',
		]) {
			const res = await call(
				install,
				'POST',
				{ planId: p.id },
				{ parentId: head.id, acceptDangers },
			);
			expect(res.status).toBe(400);
			expect((await res.json()).errors[0].path).toMatch(/^acceptDangers/);
		}
		expect((await findHeadRevision(t.db, buildId))!.id).toBe(head.id);
	});

	it('refuses a nameless plan and a starting revision of another vehicle, naming the field', async () => {
		const before = (await (await call(plans, 'GET')).json()).length;
		const nameless = await call(plans, 'POST', {}, { name: '   ' });
		expect(nameless.status).toBe(400);
		expect((await nameless.json()).errors).toEqual([
			{ path: 'name', message: 'Give the plan a name' },
		]);
		const other = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Third car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		const saved = await appendRevision(t.db, {
			buildId: other.buildId,
			parentId: null,
			document: marlinBuild,
			message: 'Elsewhere',
			authorId: member.id,
		});
		if (!saved.ok) throw new Error('revision');
		const foreign = await call(
			plans,
			'POST',
			{},
			{ name: 'Borrowed', fromRevisionId: saved.revision.id },
		);
		expect(foreign.status).toBe(400);
		expect((await foreign.json()).errors).toEqual([
			{ path: 'fromRevisionId', message: 'No such revision for this vehicle' },
		]);
		expect((await (await call(plans, 'GET')).json()).length).toBe(before);
	});

	it('answers 404 for a plan of another vehicle', async () => {
		const list = await (await call(plans, 'GET')).json();
		const other = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Other car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		const res = await callEndpoint(plan, {
			locals: localsFor(t.db, member),
			params: { teamId, vehicleId: other.vehicle.id, planId: list[0].id },
			request: jsonRequest('/x', 'GET'),
		});
		expect(res.status).toBe(404);
	});
});
