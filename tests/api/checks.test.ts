import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import * as checkItems from '../../src/pages/api/teams/[teamId]/check-items/index';
import * as checks from '../../src/pages/api/teams/[teamId]/events/[eventId]/checks';
import type { AppUser } from '../../src/lib/server/auth';
import { appendRevision } from '../../src/lib/server/db/builds';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import { callEndpoint, jsonRequest } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

describe('pre-event checks', () => {
	let t: TestDb;
	let teamId: string;
	let member: AppUser;
	let vehicleId: string;
	let eventId: string;
	beforeAll(async () => {
		t = await createTestDb();
		teamId = await makeTeam(t.db, 'Check Team');
		member = await makeUser(t.db, 'checker@sagwise.test', 'Checker');
		await addMember(t.db, teamId, member, 'member');
		const v = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Check car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		vehicleId = v.vehicle.id;
		const unfused = structuredClone(pebbleBuild);
		unfused.cables.find((c) => c.id === 'run')!.fuses = [];
		await appendRevision(t.db, {
			buildId: v.buildId,
			parentId: null,
			document: unfused,
			message: 'Run without its fuse',
			authorId: member.id,
		});
		const tomorrow = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
		eventId = (
			await t.db
				.insertInto('event')
				.values({ team_id: teamId, name: 'Next meet', starts_on: tomorrow, ends_on: tomorrow })
				.returning('id')
				.executeTakeFirstOrThrow()
		).id;
	});
	afterAll(async () => t?.drop());

	const call = (
		module: Parameters<typeof callEndpoint>[0],
		method: string,
		params: Record<string, string>,
		body?: unknown,
		query = '',
	) =>
		callEndpoint(module, {
			locals: localsFor(t.db, member),
			params: { teamId, ...params },
			request: jsonRequest(`/x${query}`, method, body),
		});

	it('fails the fusing item for the known unfused battery cable, naming it, and lists manual items as open', async () => {
		expect(
			(await call(checkItems, 'POST', {}, { label: 'Battery hold-downs torqued' })).status,
		).toBe(201);
		const res = await call(checks, 'GET', { eventId }, undefined, `?vehicleId=${vehicleId}`);
		expect(res.status).toBe(200);
		const list = await res.json();
		expect(list.revision.number).toBe(1);
		const fusing = list.items.find((i: { key: string }) => i.key === 'battery_fusing');
		expect(fusing.status).toBe('fail');
		expect(fusing.reasons.join(' ')).toMatch(/Front-to-rear run/);
		expect(list.items.find((i: { key: string }) => i.key === 'batteries_secured').status).toBe(
			'pass',
		);
		expect(list.items.find((i: { kind: string }) => i.kind === 'manual')).toMatchObject({
			label: 'Battery hold-downs torqued',
			status: 'open',
			signoff: null,
		});
	});

	it('records a sign-off with the member and the time, and withdraws it', async () => {
		const list = await (
			await call(checks, 'GET', { eventId }, undefined, `?vehicleId=${vehicleId}`)
		).json();
		const manual = list.items.find((i: { kind: string }) => i.kind === 'manual');
		const signed = await (
			await call(
				checks,
				'POST',
				{ eventId },
				{ vehicleId, itemKey: manual.key, signed: true, note: 'Checked in the pits' },
			)
		).json();
		const item = signed.items.find((i: { key: string }) => i.key === manual.key);
		expect(item.signoff).toMatchObject({ by: 'Checker', note: 'Checked in the pits' });
		expect(Date.now() - Date.parse(item.signoff.at)).toBeLessThan(60_000);
		const withdrawn = await (
			await call(checks, 'POST', { eventId }, { vehicleId, itemKey: manual.key, signed: false })
		).json();
		expect(withdrawn.items.find((i: { key: string }) => i.key === manual.key).signoff).toBeNull();
		expect(
			(await call(checks, 'POST', { eventId }, { vehicleId, itemKey: 'made_up', signed: true }))
				.status,
		).toBe(400);
	});
});
