import { randomUUID } from 'node:crypto';
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
	let captain: AppUser;
	let buildId: string;
	let vehicleId: string;
	let eventId: string;
	beforeAll(async () => {
		t = await createTestDb();
		teamId = await makeTeam(t.db, 'Check Team');
		member = await makeUser(t.db, 'checker@sagwise.test', 'Checker');
		await addMember(t.db, teamId, member, 'member');
		captain = await makeUser(t.db, 'lead@sagwise.test', 'Lead');
		await addMember(t.db, teamId, captain, 'captain');
		await t.db
			.updateTable('User')
			.set({ unitSystem: 'metric' })
			.where('id', '=', captain.id)
			.execute();
		const v = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Check car',
			description: '',
			competitionClass: 'Open Street',
			notes: '',
			ownerId: null,
		});
		vehicleId = v.vehicle.id;
		buildId = v.buildId;
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
		who: AppUser = member,
	) =>
		callEndpoint(module, {
			locals: localsFor(t.db, who),
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

	type Item = {
		key: string;
		status: string;
		outstanding: boolean;
		label: string;
		signoff: { waived: boolean; by: string; note: string } | null;
	};
	const sheet = async (who: AppUser = member) => {
		const res = await call(checks, 'GET', { eventId }, undefined, `?vehicleId=${vehicleId}`, who);
		expect(res.status).toBe(200);
		return res.json() as Promise<{
			teamName: string;
			vehicleName: string;
			vehicleClass: string;
			eventName: string;
			startsOn: string;
			units: string;
			revision: { id: string; number: number; message: string } | null;
			items: Item[];
		}>;
	};
	const fusing = (l: { items: Item[] }) => l.items.find((i) => i.key === 'battery_fusing')!;
	const sign = (body: Record<string, unknown>, who: AppUser = member) =>
		call(checks, 'POST', { eventId }, { vehicleId, signed: true, ...body }, '', who);

	it('carries what the printed sheet needs, with distances in the reader’s units', async () => {
		const forMember = await sheet();
		expect(forMember).toMatchObject({
			teamName: 'Check Team',
			vehicleName: 'Check car',
			vehicleClass: 'Open Street',
			eventName: 'Next meet',
			units: 'imperial',
			revision: { number: 1, message: 'Run without its fuse' },
		});
		// The team's default battery-fuse distance is 0.45 m: 17.7 in rounds to 18 in (0.45 / 0.0254,
		// the inch being exactly 25.4 mm by the 1959 international yard and pound agreement).
		expect(fusing(forMember).label).toMatch(/within 18 in of it/);
		expect(fusing(await sheet(captain)).label).toMatch(/within 45 cm of it/);
	});

	it('lets only a captain waive a failing computed item, and only with a written reason', async () => {
		const before = fusing(await sheet());
		expect(before).toMatchObject({ status: 'fail', outstanding: true, signoff: null });

		const byMember = await sign({ itemKey: 'battery_fusing', note: 'We know, it is fine' });
		expect(byMember.status).toBe(403);
		expect((await byMember.json()).detail).toMatch(/captain/);

		const noReason = await sign({ itemKey: 'battery_fusing', note: '  ok ' }, captain);
		expect(noReason.status).toBe(400);
		expect((await noReason.json()).errors).toEqual([
			{ path: 'note', message: expect.stringMatching(/reason for the waiver/) },
		]);
		expect(fusing(await sheet()).signoff).toBeNull();

		const waived = await sign(
			{ itemKey: 'battery_fusing', note: 'Fuse block moved next week; inspector agreed' },
			captain,
		);
		expect(waived.status).toBe(200);
		const item = fusing(await waived.json());
		expect(item).toMatchObject({
			status: 'fail',
			outstanding: false,
			signoff: { waived: true, by: 'Lead', note: 'Fuse block moved next week; inspector agreed' },
		});
		// A waiver is the captain's: a member cannot withdraw it; the captain can.
		const byMemberWithdraw = await call(
			checks,
			'POST',
			{ eventId },
			{ vehicleId, itemKey: 'battery_fusing', signed: false },
		);
		expect(byMemberWithdraw.status).toBe(403);
		expect(fusing(await sheet()).signoff).toMatchObject({ waived: true });
		const withdrawn = await call(
			checks,
			'POST',
			{ eventId },
			{ vehicleId, itemKey: 'battery_fusing', signed: false },
			'',
			captain,
		);
		expect(fusing(await withdrawn.json())).toMatchObject({ outstanding: true, signoff: null });
	});

	it('re-opens a waiver when a later revision makes the item worse, saying what it accepted', async () => {
		const drops = (l: { items: Item[] }) =>
			l.items.find((i) => i.key === 'drops') as Item & {
				measure: { value: number; text: string } | null;
				signoff: { reopened: string | null; revisionNumber: number | null } | null;
			};
		// Twice the length of the front-to-rear run: by Ohm's law its drop doubles, past the
		// 0.5 V target (common practice, no published source).
		const longer = (k: number) => {
			const d = structuredClone(pebbleBuild);
			const run = d.cables.find((c) => c.id === 'run')!;
			run.lengthM *= k;
			return d;
		};
		const save = async (document: typeof pebbleBuild, message: string) => {
			const before = await sheet();
			await appendRevision(t.db, {
				buildId,
				parentId: before.revision!.id,
				document,
				message,
				authorId: member.id,
			});
			return sheet(captain);
		};
		const first = drops(await save(longer(2), 'Longer run'));
		expect(first.status).toBe('fail');
		const givenOn = (await sheet()).revision!.number;
		const waived = drops(
			await (
				await sign({ itemKey: 'drops', note: 'Rear run rerouted after this event' }, captain)
			).json(),
		);
		expect(waived).toMatchObject({
			outstanding: false,
			signoff: { waived: true, revisionNumber: givenOn, reopened: null },
		});
		// The same figure on a later revision (only the message differs): still waived.
		const same = drops(await save(longer(2), 'Same wiring, notes tidied'));
		expect(same).toMatchObject({ outstanding: false, signoff: { reopened: null } });
		// A longer run still: the worst drop grows, and the waiver no longer covers it.
		const worse = drops(await save(longer(3), 'Run rerouted the long way'));
		expect(worse.measure!.value).toBeGreaterThan(first.measure!.value);
		expect(worse.outstanding).toBe(true);
		expect(worse.signoff!.reopened).toBe(
			`Waived on r${givenOn} at ${first.measure!.value.toFixed(2)} V; now ${worse.measure!.text}`,
		);
	});

	it('does not let an old sign-off of a passing item clear it once the build makes it fail', async () => {
		const first = await sheet();
		const secured = first.items.find((i) => i.key === 'batteries_secured')!;
		expect(secured.status).toBe('pass');
		expect((await sign({ itemKey: 'batteries_secured' })).status).toBe(200);

		const loose = structuredClone(pebbleBuild);
		loose.cables.find((c) => c.id === 'run')!.fuses = [];
		for (const b of loose.banks) b.secured = false;
		await appendRevision(t.db, {
			buildId,
			parentId: first.revision!.id,
			document: loose,
			message: 'Banks out for a swap',
			authorId: member.id,
		});
		const after = (await sheet()).items.find((i) => i.key === 'batteries_secured')!;
		expect(after).toMatchObject({ status: 'fail', outstanding: true, signoff: { waived: false } });
	});

	it('refuses a sign-off made on a sheet that changed since it was opened, answering the current one', async () => {
		const now = await sheet();
		const manual = now.items.find((i) => i.key.startsWith('manual:'))!;
		const stale = await sign({
			itemKey: manual.key,
			seen: { revisionId: randomUUID(), status: 'open' },
		});
		expect(stale.status).toBe(409);
		const body = await stale.json();
		expect(body.code).toBe('conflict');
		expect(body.current.revision.id).toBe(now.revision!.id);
		expect(
			(await sign({ itemKey: manual.key, seen: { revisionId: now.revision!.id, status: 'open' } }))
				.status,
		).toBe(200);
	});
});
