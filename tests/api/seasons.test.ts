import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as seasons from '../../src/pages/api/teams/[teamId]/seasons/index';
import * as season from '../../src/pages/api/teams/[teamId]/seasons/[seasonId]/index';
import * as purchases from '../../src/pages/api/teams/[teamId]/seasons/[seasonId]/purchases/index';
import * as teamRoute from '../../src/pages/api/teams/[teamId]';
import * as install from '../../src/pages/api/teams/[teamId]/vehicles/[vehicleId]/plans/[planId]/install';
import { pebbleBuild } from '../../db/demo/builds';
import { appendRevision } from '../../src/lib/server/db/builds';
import { insertPlan } from '../../src/lib/server/db/plans';
import { insertVehicleWithBuild } from '../../src/lib/server/db/vehicles';
import type { AppUser } from '../../src/lib/server/auth';
import { insertShelfItems } from '../../src/lib/server/db/shelf';
import type { SeasonDetail } from '../../src/lib/schemas/seasons';
import { callEndpoint, jsonRequest } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser } from '../helpers/fixtures';
import { shelfBank } from '../helpers/shelf';
import { createTestDb, type TestDb } from '../helpers/test-db';

/** A season's budget and purchases, and settling up who paid what, exact to the cent. */
describe('a season’s budget', () => {
	let t: TestDb;
	let teamId: string;
	let captain: AppUser;
	let member: AppUser;
	let viewer: AppUser;
	let seasonId: string;
	beforeAll(async () => {
		t = await createTestDb();
		teamId = await makeTeam(t.db, 'Budget Team');
		captain = await makeUser(t.db, undefined, 'Cap');
		member = await makeUser(t.db, undefined, 'Mem');
		viewer = await makeUser(t.db, undefined, 'Sponsor');
		await addMember(t.db, teamId, captain, 'captain');
		await addMember(t.db, teamId, member, 'member');
		await addMember(t.db, teamId, viewer, 'viewer');
	});
	afterAll(async () => t?.drop());

	const call = (
		module: Parameters<typeof callEndpoint>[0],
		method: string,
		params: Record<string, string>,
		body: unknown,
		who: AppUser,
		team = teamId,
	) =>
		callEndpoint(module, {
			locals: localsFor(t.db, who),
			params: { teamId: team, ...params },
			request: jsonRequest('/x', method, body),
		});
	const buy = (body: Record<string, unknown>, who = member) =>
		call(
			purchases,
			'POST',
			{ seasonId },
			{
				boughtOn: '2027-04-02',
				item: 'Ring terminals',
				quantity: 1,
				unitPriceMinor: 100,
				paidBy: member.id,
				...body,
			},
			who,
		);

	it('a captain sets a season’s budget; a member cannot, and an impossible date is named', async () => {
		const body = {
			name: '2027',
			startsOn: '2027-03-01',
			endsOn: '2027-10-31',
			budgetMinor: 150_000,
		};
		expect((await call(seasons, 'POST', {}, body, member)).status).toBe(403);
		const bad = await call(seasons, 'POST', {}, { ...body, endsOn: '2027-02-30' }, captain);
		expect(bad.status).toBe(400);
		expect(JSON.stringify(await bad.json())).toContain('endsOn');
		const res = await call(seasons, 'POST', {}, body, captain);
		expect(res.status).toBe(201);
		seasonId = ((await res.json()) as { id: string }).id;
	});

	it('records purchases by whoever paid, and settles up with balances that sum to zero', async () => {
		const [entry] = await insertShelfItems(t.db, teamId, [shelfBank()]);
		expect(
			(
				await buy({
					shelfItemId: entry!.id,
					item: entry!.label,
					quantity: 2,
					unitPriceMinor: 45_995,
				})
			).status,
		).toBe(201);
		expect(
			(await buy({ item: 'Fuse kit', unitPriceMinor: 3_001, paidBy: captain.id }, captain)).status,
		).toBe(201);
		const detail = (await (
			await call(season, 'GET', { seasonId }, undefined, viewer)
		).json()) as SeasonDetail;
		expect(detail.season.spentMinor).toBe(2 * 45_995 + 3_001);
		expect(detail.settlement.totalMinor).toBe(detail.season.spentMinor);
		expect(detail.settlement.lines.reduce((n, l) => n + l.balanceMinor, 0)).toBe(0);
		// The sponsor (a viewer) has no share; the two payers split 94 991 as 47 496 and 47 495.
		expect(detail.settlement.lines.map((l) => l.shareMinor).sort()).toEqual([47_495, 47_496]);
		expect(detail.settlement.transfers).toHaveLength(1);
		expect(detail.settlement.transfers[0]!.from).toBe('Cap');
	});

	it('refuses a payer outside the paying members, a shelf entry of another team, and a viewer', async () => {
		const viewerPaid = await buy({ paidBy: viewer.id });
		expect(viewerPaid.status).toBe(400);
		expect(JSON.stringify(await viewerPaid.json())).toContain('paidBy');
		const other = await makeTeam(t.db, 'Other');
		const [foreign] = await insertShelfItems(t.db, other, [shelfBank()]);
		const res = await buy({ shelfItemId: foreign!.id });
		expect(res.status).toBe(400);
		expect(JSON.stringify(await res.json())).toContain('shelfItemId');
		expect((await buy({ quantity: 0, unitPriceMinor: 1.5 })).status).toBe(400);
		expect((await buy({}, viewer)).status).toBe(403);
		// Another team's captain cannot see or add to it.
		const outsider = await makeUser(t.db);
		await addMember(t.db, other, outsider, 'captain');
		expect((await call(season, 'GET', { seasonId }, undefined, outsider, other)).status).toBe(404);
	});

	it('installing a plan can record its parts as purchases in a season, in the same step', async () => {
		const { vehicle, buildId } = await insertVehicleWithBuild(t.db, {
			teamId,
			name: 'Budget car',
			description: '',
			competitionClass: '',
			notes: '',
			ownerId: null,
		});
		const saved = await appendRevision(t.db, {
			buildId,
			parentId: null,
			document: pebbleBuild,
			message: 'Start',
			authorId: member.id,
		});
		if (!saved.ok) throw new Error('seed');
		const planId = await insertPlan(t.db, {
			vehicleId: vehicle.id,
			name: 'Heavier feed',
			notes: '',
			baseRevisionId: saved.revision.id,
			document: pebbleBuild,
			createdBy: member.id,
		});
		await t.db
			.insertInto('plan_part')
			.values([
				{
					plan_id: planId,
					position: 0,
					item: '1/0 AWG, 5 m',
					quantity: 5,
					unit_price_minor: 1_185,
				},
				{ plan_id: planId, position: 1, item: 'Fuse holder', quantity: 1, unit_price_minor: 3_450 },
			])
			.execute();
		const before = (await (
			await call(season, 'GET', { seasonId }, undefined, member)
		).json()) as SeasonDetail;
		const params = { vehicleId: vehicle.id, planId };
		const wrong = await call(
			install,
			'POST',
			params,
			{ parentId: saved.revision.id, recordPurchasesIn: planId },
			member,
		);
		expect(wrong.status).toBe(400);
		expect(JSON.stringify(await wrong.json())).toContain('recordPurchasesIn');
		const res = await call(
			install,
			'POST',
			params,
			{ parentId: saved.revision.id, recordPurchasesIn: seasonId },
			member,
		);
		expect(res.status).toBe(201);
		const after = (await (
			await call(season, 'GET', { seasonId }, undefined, member)
		).json()) as SeasonDetail;
		expect(after.season.spentMinor - before.season.spentMinor).toBe(5 * 1_185 + 3_450);
		const added = after.purchases
			.filter((p) => p.notes.includes('Heavier feed'))
			.sort((a, b) => a.item.localeCompare(b.item));
		expect(added.map((p) => [p.item, p.quantity, p.unitPriceMinor, p.paidByName])).toEqual([
			['1/0 AWG, 5 m', 5, 1_185, 'Mem'],
			['Fuse holder', 1, 3_450, 'Mem'],
		]);
	});

	it('keeps the currency once money is recorded', async () => {
		const res = await call(teamRoute, 'PATCH', {}, { currency: 'SEK' }, captain);
		expect(res.status).toBe(409);
	});
});
