import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as accept from '../../src/pages/api/invitations/[token]/accept';
import * as teams from '../../src/pages/api/teams/index';
import * as team from '../../src/pages/api/teams/[teamId]';
import * as invitations from '../../src/pages/api/teams/[teamId]/invitations/index';
import * as invitation from '../../src/pages/api/teams/[teamId]/invitations/[invitationId]';
import * as resend from '../../src/pages/api/teams/[teamId]/invitations/[invitationId]/resend';
import * as member from '../../src/pages/api/teams/[teamId]/members/[userId]';
import * as members from '../../src/pages/api/teams/[teamId]/members/index';
import type { AppUser } from '../../src/lib/server/auth';
import { callEndpoint, jsonRequest } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser } from '../helpers/fixtures';
import { linkIn, startTestMail, type TestMail } from '../helpers/mail';
import { createTestDb, type TestDb } from '../helpers/test-db';

describe('team routes', () => {
	let t: TestDb;
	let mail: TestMail;
	beforeAll(async () => {
		t = await createTestDb();
		mail = await startTestMail();
	});
	afterAll(async () => {
		await mail?.close();
		await t?.drop();
	});

	const as = (user: AppUser | null) => ({
		call: (
			module: Parameters<typeof callEndpoint>[0],
			method: string,
			params: Record<string, string>,
			body?: unknown,
		) =>
			callEndpoint(module, {
				locals: localsFor(t.db, user, mail.mailer),
				params,
				request: jsonRequest('/x', method, body),
			}),
	});
	const roleOf = async (teamId: string, userId: string) =>
		(
			await t.db
				.selectFrom('membership')
				.select('role')
				.where('team_id', '=', teamId)
				.where('user_id', '=', userId)
				.executeTakeFirst()
		)?.role;

	it('creates a team whose creator is captain', async () => {
		const founder = await makeUser(t.db);
		const res = await as(founder).call(teams, 'POST', {}, { name: '  Night Shift Audio  ' });
		expect(res.status).toBe(201);
		const body = await res.json();
		expect(body).toMatchObject({ name: 'Night Shift Audio', role: 'captain' });
		expect(await roleOf(body.id, founder.id)).toBe('captain');
		const list = await (await as(founder).call(teams, 'GET', {})).json();
		expect(list.map((x: { id: string }) => x.id)).toContain(body.id);
	});

	it('sets the plan currency: a code is upper-cased and kept, anything else is refused beside the field', async () => {
		const founder = await makeUser(t.db);
		const { id: teamId } = await (
			await as(founder).call(teams, 'POST', {}, { name: 'Currency Crew' })
		).json();
		expect((await as(founder).call(team, 'PATCH', { teamId }, { currency: 'eur' })).status).toBe(
			204,
		);
		expect(await (await as(founder).call(team, 'GET', { teamId })).json()).toMatchObject({
			currency: 'EUR',
		});
		const bad = await as(founder).call(team, 'PATCH', { teamId }, { currency: 'EURO' });
		expect(bad.status).toBe(400);
		expect((await bad.json()).errors).toEqual([
			{ path: 'currency', message: 'Use a three-letter currency code such as EUR' },
		]);
		expect(await (await as(founder).call(team, 'GET', { teamId })).json()).toMatchObject({
			currency: 'EUR',
		});
	});

	it('invites by e-mail; the invitee follows the mailed link once and joins with the role', async () => {
		const captain = await makeUser(t.db, 'cap.one@sagwise.test', 'Cap One');
		const teamId = await makeTeam(t.db, 'Invite Team');
		await addMember(t.db, teamId, captain, 'captain');

		const res = await as(captain).call(
			invitations,
			'POST',
			{ teamId },
			{ email: 'Newbie@Sagwise.test', role: 'member' },
		);
		expect(res.status).toBe(201);
		const message = await mail.waitFor('newbie@sagwise.test');
		expect(message.subject).toContain('Invite Team');
		expect(message.text).toMatch(/expires/);
		const token = linkIn(message, '/invitations/').split('/invitations/')[1]!;

		const pending = await (await as(captain).call(invitations, 'GET', { teamId })).json();
		expect(pending).toEqual([
			expect.objectContaining({ email: 'newbie@sagwise.test', role: 'member', expired: false }),
		]);

		const newbie = await makeUser(t.db, 'newbie@sagwise.test');
		const joined = await as(newbie).call(accept, 'POST', { token });
		expect(joined.status).toBe(200);
		expect(await roleOf(teamId, newbie.id)).toBe('member');

		const reused = await as(newbie).call(accept, 'POST', { token });
		expect(reused.status).toBe(410);
		expect((await reused.json()).code).toBe('token_used');
		expect(await (await as(captain).call(invitations, 'GET', { teamId })).json()).toEqual([]);
	});

	it('refuses an expired invitation, and one opened by another address', async () => {
		const captain = await makeUser(t.db);
		const teamId = await makeTeam(t.db);
		await addMember(t.db, teamId, captain, 'captain');
		await as(captain).call(
			invitations,
			'POST',
			{ teamId },
			{ email: 'slow@sagwise.test', role: 'viewer' },
		);
		const token = linkIn(await mail.waitFor('slow@sagwise.test'), '/invitations/').split(
			'/invitations/',
		)[1]!;

		const stranger = await makeUser(t.db, 'stranger@sagwise.test');
		const wrong = await as(stranger).call(accept, 'POST', { token });
		expect(wrong.status).toBe(403);
		expect((await wrong.json()).code).toBe('email_mismatch');

		await t.db
			.updateTable('invitation')
			.set({ expires_at: new Date(Date.now() - 1) })
			.where('email', '=', 'slow@sagwise.test')
			.execute();
		const slow = await makeUser(t.db, 'slow@sagwise.test');
		const late = await as(slow).call(accept, 'POST', { token });
		expect(late.status).toBe(410);
		expect((await late.json()).code).toBe('token_expired');
		expect(await roleOf(teamId, slow.id)).toBeUndefined();
	});

	it('resends with a new link (the old one stops working) and revokes', async () => {
		const captain = await makeUser(t.db);
		const teamId = await makeTeam(t.db);
		await addMember(t.db, teamId, captain, 'captain');
		const created = await (
			await as(captain).call(
				invitations,
				'POST',
				{ teamId },
				{ email: 'twice@sagwise.test', role: 'member' },
			)
		).json();
		const first = linkIn(await mail.waitFor('twice@sagwise.test'), '/invitations/').split(
			'/invitations/',
		)[1]!;
		expect(
			(await as(captain).call(resend, 'POST', { teamId, invitationId: created.id })).status,
		).toBe(200);
		const second = linkIn(
			await mail.waitFor('twice@sagwise.test', { after: 1 }),
			'/invitations/',
		).split('/invitations/')[1]!;
		expect(second).not.toBe(first);
		const invitee = await makeUser(t.db, 'twice@sagwise.test');
		expect((await as(invitee).call(accept, 'POST', { token: first })).status).toBe(404);

		expect(
			(await as(captain).call(invitation, 'DELETE', { teamId, invitationId: created.id })).status,
		).toBe(204);
		expect((await as(invitee).call(accept, 'POST', { token: second })).status).toBe(410);
	});

	it('changes roles and protects the last captain from demotion and leaving', async () => {
		const captain = await makeUser(t.db);
		const other = await makeUser(t.db);
		const teamId = await makeTeam(t.db);
		await addMember(t.db, teamId, captain, 'captain');
		await addMember(t.db, teamId, other, 'viewer');

		expect(
			(await as(captain).call(member, 'PATCH', { teamId, userId: other.id }, { role: 'member' }))
				.status,
		).toBe(204);
		expect(await roleOf(teamId, other.id)).toBe('member');

		const demote = await as(captain).call(
			member,
			'PATCH',
			{ teamId, userId: captain.id },
			{ role: 'member' },
		);
		expect(demote.status).toBe(409);
		expect((await demote.json()).code).toBe('last_captain');
		const leave = await as(captain).call(member, 'DELETE', { teamId, userId: captain.id });
		expect(leave.status).toBe(409);
		expect(await roleOf(teamId, captain.id)).toBe('captain');

		// With a second captain the first may step down.
		await as(captain).call(member, 'PATCH', { teamId, userId: other.id }, { role: 'captain' });
		expect(
			(await as(captain).call(member, 'PATCH', { teamId, userId: captain.id }, { role: 'member' }))
				.status,
		).toBe(204);
	});

	it('lets anyone leave, but only captains remove others', async () => {
		const captain = await makeUser(t.db);
		const a = await makeUser(t.db);
		const b = await makeUser(t.db);
		const teamId = await makeTeam(t.db);
		await addMember(t.db, teamId, captain, 'captain');
		await addMember(t.db, teamId, a, 'member');
		await addMember(t.db, teamId, b, 'viewer');
		expect((await as(a).call(member, 'DELETE', { teamId, userId: b.id })).status).toBe(403);
		expect((await as(b).call(member, 'DELETE', { teamId, userId: b.id })).status).toBe(204);
		expect((await as(captain).call(member, 'DELETE', { teamId, userId: a.id })).status).toBe(204);
		expect(await (await as(captain).call(members, 'GET', { teamId })).json()).toHaveLength(1);
	});

	it('renames, and deletes only when the name is repeated', async () => {
		const captain = await makeUser(t.db);
		const teamId = await makeTeam(t.db, 'Doomed');
		await addMember(t.db, teamId, captain, 'captain');
		expect(
			(await as(captain).call(team, 'PATCH', { teamId }, { name: 'Still Doomed' })).status,
		).toBe(204);
		const wrong = await as(captain).call(team, 'DELETE', { teamId }, { confirmName: 'Doomed' });
		expect(wrong.status).toBe(400);
		expect((await wrong.json()).code).toBe('confirmation_mismatch');
		expect(
			(await as(captain).call(team, 'DELETE', { teamId }, { confirmName: 'Still Doomed' })).status,
		).toBe(204);
		expect(
			await t.db.selectFrom('team').where('id', '=', teamId).selectAll().executeTakeFirst(),
		).toBeUndefined();
	});
});
