import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { marlinBuild, pebbleBuild } from '../../db/demo/builds';
import { buildReport } from '../../src/engine/report';
import * as diff from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/diff';
import * as revisions from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/revisions/index';
import * as report from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/revisions/[revisionId]/report';
import * as restore from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/revisions/[revisionId]/restore';
import * as spice from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/revisions/[revisionId]/spice';
import * as documentJson from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/revisions/[revisionId]/document.json';
import * as vehicles from '../../src/pages/api/teams/[teamId]/vehicles/index';
import * as vehicle from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/index';
import type { AppUser } from '../../src/lib/server/auth';
import { callEndpoint, jsonRequest } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

describe('vehicles, builds and revisions', () => {
	let t: TestDb;
	let teamId: string;
	let member: AppUser;
	let other: AppUser;
	beforeAll(async () => {
		t = await createTestDb();
		teamId = await makeTeam(t.db, 'Build Team');
		member = await makeUser(t.db, 'builder@sagwise.test', 'Builder');
		other = await makeUser(t.db, 'second@sagwise.test', 'Second');
		await addMember(t.db, teamId, member, 'member');
		await addMember(t.db, teamId, other, 'member');
	});
	afterAll(async () => t?.drop());

	const call = (
		user: AppUser,
		module: Parameters<typeof callEndpoint>[0],
		method: string,
		params: Record<string, string>,
		body?: unknown,
		query = '',
	) =>
		callEndpoint(module, {
			locals: localsFor(t.db, user),
			params: { teamId, ...params },
			request: jsonRequest(`/x${query}`, method, body),
		});

	async function newVehicle(name: string) {
		const res = await call(member, vehicles, 'POST', {}, { name, description: 'Test car' });
		expect(res.status).toBe(201);
		return (await res.json()) as { id: string; headRevisionId: null };
	}

	/** Saves a vehicle's first revision (its parent is none) and answers it. */
	async function firstRevision(vehicleId: string, document: typeof pebbleBuild, message = 'One') {
		const res = await call(
			member,
			revisions,
			'POST',
			{ vehicleId },
			{ parentId: null, message, document },
		);
		expect(res.status).toBe(201);
		return res.json();
	}

	it('chains revisions: each names its parent and takes the next number, and the head follows', async () => {
		const v = await newVehicle('Chain');
		const r1 = await firstRevision(v.id, pebbleBuild, 'First');
		const changed = structuredClone(pebbleBuild);
		changed.cables.find((c) => c.id === 'run')!.size = { kind: 'awg', awg: '1/0' };
		const res2 = await call(
			member,
			revisions,
			'POST',
			{ vehicleId: v.id },
			{ parentId: r1.id, message: 'Run to 1/0', document: changed },
		);
		expect(res2.status).toBe(201);
		const r2 = await res2.json();
		expect(r1.number).toBe(1);
		expect(r2).toMatchObject({
			number: 2,
			parentId: r1.id,
			authorName: 'Builder',
			message: 'Run to 1/0',
		});
		expect(r2.document).toEqual(changed);
		const list = await (await call(member, revisions, 'GET', { vehicleId: v.id })).json();
		expect(list.map((r: { number: number }) => r.number)).toEqual([2, 1]);
		expect(
			(await (await call(member, vehicle, 'GET', { vehicleId: v.id })).json()).headRevisionId,
		).toBe(r2.id);
	});

	it('answers 409 with both versions when someone saved on the same parent, and writes nothing', async () => {
		const v = await newVehicle('Race');
		const base = await (
			await call(
				member,
				revisions,
				'POST',
				{ vehicleId: v.id },
				{ parentId: null, message: 'Base', document: marlinBuild },
			)
		).json();
		const theirs = structuredClone(marlinBuild);
		theirs.banks[0]!.stateOfCharge = 0.5;
		const mine = structuredClone(marlinBuild);
		mine.alternators[0]!.setPointV = 14.4;
		expect(
			(
				await call(
					other,
					revisions,
					'POST',
					{ vehicleId: v.id },
					{ parentId: base.id, message: 'Theirs', document: theirs },
				)
			).status,
		).toBe(201);
		const clash = await call(
			member,
			revisions,
			'POST',
			{ vehicleId: v.id },
			{ parentId: base.id, message: 'Mine', document: mine },
		);
		expect(clash.status).toBe(409);
		const body = await clash.json();
		expect(body.code).toBe('conflict');
		expect(body.head).toMatchObject({ number: 2, message: 'Theirs' });
		expect(body.head.document).toEqual(theirs);
		expect(body.yours.document).toEqual(mine);
		expect(await (await call(member, revisions, 'GET', { vehicleId: v.id })).json()).toHaveLength(
			2,
		);
		// Saving on top of theirs goes through.
		expect(
			(
				await call(
					member,
					revisions,
					'POST',
					{ vehicleId: v.id },
					{ parentId: body.head.id, message: 'Mine, merged', document: mine },
				)
			).status,
		).toBe(201);
	});

	it('refuses an invalid or unsolvable document with field paths, saving nothing', async () => {
		const v = await newVehicle('Broken');
		const bad = structuredClone(pebbleBuild) as unknown as { cables: Array<{ lengthM: number }> };
		bad.cables[0]!.lengthM = -2;
		const res = await call(
			member,
			revisions,
			'POST',
			{ vehicleId: v.id },
			{ parentId: null, message: 'Bad', document: bad },
		);
		expect(res.status).toBe(400);
		expect((await res.json()).errors.map((e: { path: string }) => e.path)).toContain(
			'document.cables.0.lengthM',
		);
		const floating = structuredClone(pebbleBuild);
		floating.cables = floating.cables.filter((c) => c.id !== 'amp_gnd');
		const res2 = await call(
			member,
			revisions,
			'POST',
			{ vehicleId: v.id },
			{ parentId: null, message: 'Floating', document: floating },
		);
		expect(res2.status).toBe(400);
		expect(await (await call(member, revisions, 'GET', { vehicleId: v.id })).json()).toEqual([]);
	});

	it('restores an old revision as a new one and diffs component by component', async () => {
		const v = await newVehicle('Restore');
		const r1 = await firstRevision(v.id, pebbleBuild, 'One');
		const changed = structuredClone(pebbleBuild);
		changed.cables.find((c) => c.id === 'run')!.size = { kind: 'awg', awg: '1/0' };
		changed.amplifiers[0]!.ratedPowerW = 2000;
		const r2 = await (
			await call(
				member,
				revisions,
				'POST',
				{ vehicleId: v.id },
				{ parentId: r1.id, message: 'Two', document: changed },
			)
		).json();

		const d = await (
			await call(member, diff, 'GET', { vehicleId: v.id }, undefined, `?from=${r1.id}&to=${r2.id}`)
		).json();
		expect(d.changes).toEqual([
			{
				group: 'amplifiers',
				id: 'mono',
				label: 'Mono amplifier',
				kind: 'changed',
				fields: [
					{ field: 'ratedPowerW', before: pebbleBuild.amplifiers[0]!.ratedPowerW, after: 2000 },
				],
			},
			{
				group: 'cables',
				id: 'run',
				label: 'Front-to-rear run',
				kind: 'changed',
				fields: [{ field: 'size.awg', before: '4', after: '1/0' }],
			},
		]);

		const res = await call(
			member,
			restore,
			'POST',
			{ vehicleId: v.id, revisionId: r1.id },
			{ parentId: r2.id },
		);
		expect(res.status).toBe(201);
		const r3 = await res.json();
		expect(r3).toMatchObject({ number: 3, parentId: r2.id, restoredFromNumber: 1 });
		expect(r3.message).toMatch(/Restore revision 1/);
		expect(r3.document).toEqual(pebbleBuild);
		// A stale restore is refused like any stale save.
		expect(
			(
				await call(
					member,
					restore,
					'POST',
					{ vehicleId: v.id, revisionId: r1.id },
					{ parentId: r2.id },
				)
			).status,
		).toBe(409);
		// The database itself refuses to change a saved revision.
		await expect(
			t.db.updateTable('revision').set({ message: 'rewritten' }).where('id', '=', r1.id).execute(),
		).rejects.toThrow(/immutable/);
	});

	it('computes the report route with the same numbers as the engine, under the scenario given', async () => {
		const v = await newVehicle('Report');
		const r1 = await firstRevision(v.id, marlinBuild, 'One');
		const res = await call(
			member,
			report,
			'GET',
			{ vehicleId: v.id, revisionId: r1.id },
			undefined,
			'?engineRpm=900&voltagesV=12,14.4',
		);
		expect(res.status).toBe(200);
		const body = await res.json();
		const expected = JSON.parse(
			JSON.stringify(buildReport(marlinBuild, { engineRpm: 900, voltagesV: [12, 14.4] })),
		);
		expect(body.report).toEqual(expected);
		const bad = await call(
			member,
			report,
			'GET',
			{ vehicleId: v.id, revisionId: r1.id },
			undefined,
			'?engineRpm=-5',
		);
		expect(bad.status).toBe(400);
		expect((await bad.json()).errors[0].path).toBe('engineRpm');
	});

	it('answers a repeat report with its ETag: 304 for a client that holds it, a new tag for another scenario', async () => {
		const v = await newVehicle('Cached report');
		const r1 = await firstRevision(v.id, pebbleBuild, 'One');
		const get = (query: string, headers: Record<string, string> = {}) =>
			callEndpoint(report, {
				locals: localsFor(t.db, member),
				params: { teamId, vehicleId: v.id, revisionId: r1.id },
				request: jsonRequest(`/x${query}`, 'GET', undefined, headers),
			});
		const first = await get('?engineRpm=1200');
		const etag = first.headers.get('etag')!;
		expect(etag).toMatch(/^"[\w-]+"$/);
		expect(first.headers.get('cache-control')).toBe('private, no-cache');
		const again = await get('?engineRpm=1200');
		expect(again.headers.get('etag')).toBe(etag);
		expect(await again.json()).toEqual(await first.json());
		const held = await get('?engineRpm=1200', { 'if-none-match': etag });
		expect(held.status).toBe(304);
		expect(await held.text()).toBe('');
		const other = await get('?engineRpm=1800', { 'if-none-match': etag });
		expect(other.status).toBe(200);
		expect(other.headers.get('etag')).not.toBe(etag);
		expect((await other.json()).report).toEqual(
			JSON.parse(JSON.stringify(buildReport(pebbleBuild, { engineRpm: 1800 }))),
		);
		// The ETag is checked after access: an outsider gets the 404, never a 304.
		const outsider = await makeUser(t.db, 'outsider-etag@sagwise.test', 'Out');
		const refused = await callEndpoint(report, {
			locals: localsFor(t.db, outsider),
			params: { teamId, vehicleId: v.id, revisionId: r1.id },
			request: jsonRequest('/x?engineRpm=1200', 'GET', undefined, { 'if-none-match': etag }),
		});
		expect(refused.status).toBe(404);
	});

	it('exports a revision as a SPICE netlist', async () => {
		const v = await newVehicle('Spice');
		const r1 = await firstRevision(v.id, pebbleBuild, 'One');
		const res = await call(member, spice, 'GET', { vehicleId: v.id, revisionId: r1.id });
		expect(res.headers.get('content-type')).toMatch(/text\/plain/);
		const text = await res.text();
		expect(text).toMatch(/^\* Spice revision 1/);
		expect(text).toContain('.nodeset');
		expect(text.match(/^rc\d+ /gm)).toHaveLength(pebbleBuild.cables.length);
	});

	it('downloads a revision as its JSON build document, which uploads back as an equal revision', async () => {
		const v = await newVehicle('Json');
		const r1 = await firstRevision(v.id, marlinBuild, 'One');
		const res = await call(member, documentJson, 'GET', { vehicleId: v.id, revisionId: r1.id });
		expect(res.headers.get('content-disposition')).toMatch(/Json-r1\.build\.json/);
		const file = JSON.parse(await res.text());
		expect(file).toEqual(marlinBuild);
		const back = await call(
			member,
			revisions,
			'POST',
			{ vehicleId: v.id },
			{ parentId: r1.id, message: 'Loaded from file', document: file },
		);
		expect(back.status).toBe(201);
		expect((await back.json()).document).toEqual(marlinBuild);
	});

	it('archives a vehicle and hides it from the default list', async () => {
		const v = await newVehicle('Old');
		expect(
			(await call(member, vehicle, 'PATCH', { vehicleId: v.id }, { archived: true })).status,
		).toBe(200);
		const active = await (await call(member, vehicles, 'GET', {})).json();
		expect(active.map((x: { id: string }) => x.id)).not.toContain(v.id);
		const archived = await (
			await call(member, vehicles, 'GET', {}, undefined, '?archived=true')
		).json();
		expect(archived.map((x: { id: string }) => x.id)).toContain(v.id);
	});
});
