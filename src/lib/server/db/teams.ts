import { type Kysely, sql } from 'kysely';
import type { Database, InvitationRow, Role } from '@/lib/server/db/schema';
import type { InvitationDto, MemberDto, TeamSettingsDto, TeamSummary } from '@/lib/schemas/teams';

type Db = Kysely<Database>;

export async function findTeamsForUser(db: Db, userId: string): Promise<TeamSummary[]> {
	const rows = await db
		.selectFrom('membership as m')
		.innerJoin('team as t', 't.id', 'm.team_id')
		.select(['t.id', 't.name', 'm.role'])
		.select((eb) => [
			eb
				.selectFrom('membership as mm')
				.whereRef('mm.team_id', '=', 't.id')
				.select((e) => e.fn.countAll<number>().as('c'))
				.as('members'),
			eb
				.selectFrom('vehicle as v')
				.whereRef('v.team_id', '=', 't.id')
				.where('v.archived_at', 'is', null)
				.select((e) => e.fn.countAll<number>().as('c'))
				.as('vehicles'),
		])
		.where('m.user_id', '=', userId)
		.orderBy('t.name')
		.execute();
	return rows.map((r) => ({
		id: r.id,
		name: r.name,
		role: r.role,
		members: Number(r.members),
		vehicles: Number(r.vehicles),
	}));
}

export function findMembership(db: Db, teamId: string, userId: string) {
	return db
		.selectFrom('membership as m')
		.innerJoin('team as t', 't.id', 'm.team_id')
		.innerJoin('User as u', 'u.id', 'm.user_id')
		.select([
			'm.team_id',
			'm.user_id',
			'm.role',
			't.name as team_name',
			't.data_version',
			'u.unitSystem',
		])
		.where('m.team_id', '=', teamId)
		.where('m.user_id', '=', userId)
		.executeTakeFirst();
}

/** Creates a team with its creator as captain, in one transaction. */
export async function insertTeamWithCaptain(
	db: Db,
	name: string,
	userId: string,
): Promise<{ id: string; name: string }> {
	return db.transaction().execute(async (trx) => {
		const team = await trx
			.insertInto('team')
			.values({ name })
			.returning(['id', 'name'])
			.executeTakeFirstOrThrow();
		await trx
			.insertInto('membership')
			.values({ team_id: team.id, user_id: userId, role: 'captain' })
			.execute();
		return team;
	});
}

export async function renameTeam(db: Db, teamId: string, name: string): Promise<void> {
	await db.updateTable('team').set({ name }).where('id', '=', teamId).execute();
}

export async function deleteTeam(db: Db, teamId: string): Promise<void> {
	await db.deleteFrom('team').where('id', '=', teamId).execute();
}

export async function findMembers(db: Db, teamId: string): Promise<MemberDto[]> {
	const rows = await db
		.selectFrom('membership as m')
		.innerJoin('User as u', 'u.id', 'm.user_id')
		.select(['u.id', 'u.name', 'u.email', 'm.role', 'm.created_at'])
		.where('m.team_id', '=', teamId)
		.orderBy(sql`case m.role when 'captain' then 0 when 'member' then 1 else 2 end`)
		.orderBy('u.email')
		.execute();
	return rows.map((r) => ({
		userId: r.id,
		name: r.name,
		email: r.email,
		role: r.role,
		joinedAt: r.created_at.toISOString(),
	}));
}

/** Locks the team's captain rows, so two concurrent demotions cannot both leave it without one. */
async function lockCaptains(db: Db, teamId: string): Promise<string[]> {
	const rows = await db
		.selectFrom('membership')
		.select('user_id')
		.where('team_id', '=', teamId)
		.where('role', '=', 'captain')
		.forUpdate()
		.execute();
	return rows.map((r) => r.user_id);
}

export type MembershipChange = { ok: true } | { ok: false; reason: 'not_member' | 'last_captain' };

export async function changeRole(
	db: Db,
	teamId: string,
	userId: string,
	role: Role,
): Promise<MembershipChange> {
	return db.transaction().execute(async (trx) => {
		const captains = await lockCaptains(trx, teamId);
		const member = await trx
			.selectFrom('membership')
			.select('role')
			.where('team_id', '=', teamId)
			.where('user_id', '=', userId)
			.forUpdate()
			.executeTakeFirst();
		if (!member) return { ok: false, reason: 'not_member' } as const;
		if (member.role === 'captain' && role !== 'captain' && captains.length <= 1)
			return { ok: false, reason: 'last_captain' } as const;
		await trx
			.updateTable('membership')
			.set({ role })
			.where('team_id', '=', teamId)
			.where('user_id', '=', userId)
			.execute();
		return { ok: true } as const;
	});
}

export async function removeMember(
	db: Db,
	teamId: string,
	userId: string,
): Promise<MembershipChange> {
	return db.transaction().execute(async (trx) => {
		const captains = await lockCaptains(trx, teamId);
		const member = await trx
			.selectFrom('membership')
			.select('role')
			.where('team_id', '=', teamId)
			.where('user_id', '=', userId)
			.forUpdate()
			.executeTakeFirst();
		if (!member) return { ok: false, reason: 'not_member' } as const;
		if (member.role === 'captain' && captains.length <= 1)
			return { ok: false, reason: 'last_captain' } as const;
		await trx
			.deleteFrom('membership')
			.where('team_id', '=', teamId)
			.where('user_id', '=', userId)
			.execute();
		// What mentioned them in this team is no longer theirs to read, nor to be mailed.
		await trx
			.deleteFrom('notification')
			.where('team_id', '=', teamId)
			.where('user_id', '=', userId)
			.execute();
		return { ok: true } as const;
	});
}

// ---- invitations

export const INVITATION_TTL_MS = 7 * 24 * 3600 * 1000;

export function toInvitationDto(
	r: InvitationRow & { inviter_name?: string | null },
): InvitationDto {
	return {
		id: r.id,
		email: r.email,
		role: r.role,
		invitedBy: r.inviter_name ?? null,
		createdAt: r.created_at.toISOString(),
		lastSentAt: r.last_sent_at.toISOString(),
		expiresAt: r.expires_at.toISOString(),
		expired: r.expires_at.getTime() < Date.now(),
	};
}

export async function findPendingInvitations(db: Db, teamId: string): Promise<InvitationDto[]> {
	const rows = await db
		.selectFrom('invitation as i')
		.leftJoin('User as u', 'u.id', 'i.invited_by')
		.selectAll('i')
		.select('u.name as inviter_name')
		.where('i.team_id', '=', teamId)
		.where('i.accepted_at', 'is', null)
		.where('i.revoked_at', 'is', null)
		.orderBy('i.created_at', 'desc')
		.execute();
	return rows.map(toInvitationDto);
}

/**
 * Creates an open invitation, or renews the open one for the same address (new token, new expiry):
 * an address has at most one open invitation per team.
 */
export async function upsertInvitation(
	db: Db,
	p: { teamId: string; email: string; role: Role; invitedBy: string; tokenHash: string },
): Promise<InvitationRow> {
	return db.transaction().execute(async (trx) => {
		const open = await trx
			.selectFrom('invitation')
			.selectAll()
			.where('team_id', '=', p.teamId)
			.where('email', '=', p.email)
			.where('accepted_at', 'is', null)
			.where('revoked_at', 'is', null)
			.forUpdate()
			.executeTakeFirst();
		const expires_at = new Date(Date.now() + INVITATION_TTL_MS);
		if (open) {
			return trx
				.updateTable('invitation')
				.set({
					role: p.role,
					token_hash: p.tokenHash,
					invited_by: p.invitedBy,
					expires_at,
					last_sent_at: new Date(),
				})
				.where('id', '=', open.id)
				.returningAll()
				.executeTakeFirstOrThrow();
		}
		return trx
			.insertInto('invitation')
			.values({
				team_id: p.teamId,
				email: p.email,
				role: p.role,
				invited_by: p.invitedBy,
				token_hash: p.tokenHash,
				expires_at,
			})
			.returningAll()
			.executeTakeFirstOrThrow();
	});
}

export function findOpenInvitation(db: Db, teamId: string, invitationId: string) {
	return db
		.selectFrom('invitation')
		.selectAll()
		.where('team_id', '=', teamId)
		.where('id', '=', invitationId)
		.where('accepted_at', 'is', null)
		.where('revoked_at', 'is', null)
		.executeTakeFirst();
}

export async function renewInvitationToken(
	db: Db,
	invitationId: string,
	tokenHash: string,
): Promise<InvitationRow> {
	return db
		.updateTable('invitation')
		.set({
			token_hash: tokenHash,
			last_sent_at: new Date(),
			expires_at: new Date(Date.now() + INVITATION_TTL_MS),
		})
		.where('id', '=', invitationId)
		.returningAll()
		.executeTakeFirstOrThrow();
}

export async function revokeInvitation(db: Db, invitationId: string): Promise<void> {
	await db
		.updateTable('invitation')
		.set({ revoked_at: new Date() })
		.where('id', '=', invitationId)
		.execute();
}

export function findInvitationByTokenHash(db: Db, tokenHash: string) {
	return db
		.selectFrom('invitation as i')
		.innerJoin('team as t', 't.id', 'i.team_id')
		.selectAll('i')
		.select('t.name as team_name')
		.where('i.token_hash', '=', tokenHash)
		.executeTakeFirst();
}

export type AcceptResult =
	| { ok: true; teamId: string; role: Role }
	| { ok: false; reason: 'unknown' | 'used' | 'revoked' | 'expired' | 'email_mismatch' };

/** Accepts an invitation once: joins the team (or keeps the better of two roles) in one transaction. */
export async function acceptInvitation(
	db: Db,
	tokenHash: string,
	user: { id: string; email: string },
): Promise<AcceptResult> {
	return db.transaction().execute(async (trx): Promise<AcceptResult> => {
		const inv = await trx
			.selectFrom('invitation')
			.selectAll()
			.where('token_hash', '=', tokenHash)
			.forUpdate()
			.executeTakeFirst();
		if (!inv) return { ok: false, reason: 'unknown' };
		if (inv.accepted_at) return { ok: false, reason: 'used' };
		if (inv.revoked_at) return { ok: false, reason: 'revoked' };
		if (inv.expires_at.getTime() < Date.now()) return { ok: false, reason: 'expired' };
		if (inv.email !== user.email.toLowerCase()) return { ok: false, reason: 'email_mismatch' };
		const existing = await trx
			.selectFrom('membership')
			.select('role')
			.where('team_id', '=', inv.team_id)
			.where('user_id', '=', user.id)
			.executeTakeFirst();
		const rank = { viewer: 0, member: 1, captain: 2 } as const;
		if (!existing)
			await trx
				.insertInto('membership')
				.values({ team_id: inv.team_id, user_id: user.id, role: inv.role })
				.execute();
		else if (rank[inv.role] > rank[existing.role]) {
			await trx
				.updateTable('membership')
				.set({ role: inv.role })
				.where('team_id', '=', inv.team_id)
				.where('user_id', '=', user.id)
				.execute();
		}
		await trx
			.updateTable('invitation')
			.set({ accepted_at: new Date(), accepted_by: user.id })
			.where('id', '=', inv.id)
			.execute();
		return {
			ok: true,
			teamId: inv.team_id,
			role: existing && rank[existing.role] > rank[inv.role] ? existing.role : inv.role,
		};
	});
}

// ---- settings

/** The team's settings as its members see them (name and role from the caller's access). */
/** The team's own settings: plan currency, reminder days, battery-fuse distance (m). */
export function findTeamSettingsRow(db: Db, teamId: string) {
	return db
		.selectFrom('team')
		.select(['name', 'currency', 'reminder_days', 'fuse_distance_m', 'viewers_may_comment'])
		.where('id', '=', teamId)
		.executeTakeFirstOrThrow();
}

export async function findTeamSettings(
	db: Db,
	access: { teamId: string; teamName: string; role: Role },
): Promise<TeamSettingsDto> {
	const team = await findTeamSettingsRow(db, access.teamId);
	return {
		id: access.teamId,
		name: access.teamName,
		role: access.role,
		currency: team.currency,
		reminderDays: team.reminder_days,
		fuseDistanceM: team.fuse_distance_m,
		viewersMayComment: team.viewers_may_comment,
	};
}

export async function updateTeamSettings(
	db: Db,
	teamId: string,
	s: { currency?: string; reminderDays?: number; viewersMayComment?: boolean },
): Promise<void> {
	const set = {
		...(s.currency !== undefined && { currency: s.currency }),
		...(s.viewersMayComment !== undefined && { viewers_may_comment: s.viewersMayComment }),
		...(s.reminderDays !== undefined && { reminder_days: s.reminderDays }),
	};
	if (Object.keys(set).length)
		await db.updateTable('team').set(set).where('id', '=', teamId).execute();
}

/**
 * Whether the team has money recorded in its currency (a priced shelf entry, a priced line of a
 * plan's parts, a season's budget or a purchase): its currency can no longer change, since no amount would be converted.
 */
export async function teamHasMoney(db: Db, teamId: string): Promise<boolean> {
	const row = await db
		.selectNoFrom((eb) => [
			eb
				.or([
					eb.exists(
						eb
							.selectFrom('shelf_item')
							.select('id')
							.where('team_id', '=', teamId)
							.where('price_minor', '>', 0 as never),
					),
					eb.exists(
						eb
							.selectFrom('purchase as pu')
							.innerJoin('season as se', 'se.id', 'pu.season_id')
							.select('pu.id')
							.where('se.team_id', '=', teamId)
							.where('se.budget_minor', '>=', 0 as never),
					),
					eb.exists(
						eb
							.selectFrom('season')
							.select('id')
							.where('team_id', '=', teamId)
							.where('budget_minor', '>', 0 as never),
					),
					eb.exists(
						eb
							.selectFrom('plan_part as pp')
							.innerJoin('plan as p', 'p.id', 'pp.plan_id')
							.innerJoin('vehicle as v', 'v.id', 'p.vehicle_id')
							.select('pp.plan_id')
							.where('v.team_id', '=', teamId)
							.where('pp.unit_price_minor', '>', 0 as never),
					),
				])
				.as('has'),
		])
		.executeTakeFirstOrThrow();
	return Boolean(row.has);
}
