import type { Role } from '@/lib/server/db/schema';
import { parseUuid } from '../schemas/ids';
import { findMembership } from './db/teams';
import { problem } from './http';

const RANK: Record<Role, number> = { viewer: 0, member: 1, captain: 2 };

export const roleAtLeast = (role: Role, min: Role) => RANK[role] >= RANK[min];

export interface TeamAccess {
	teamId: string;
	teamName: string;
	userId: string;
	role: Role;
}

export type AccessResult = { ok: true; access: TeamAccess } | { ok: false; status: 401 | 403 | 404; response: Response };

/**
 * The one place that decides who may touch a team: 401 when nobody is signed in, 404 when the id
 * is malformed or the caller is not a member (never revealing that the team exists), 403 when the
 * caller's role is below `min` (viewers read; members write; captains manage).
 */
export async function requireTeamRole(locals: Pick<App.Locals, 'db' | 'user'>, teamIdParam: string | undefined, min: Role): Promise<AccessResult> {
	if (!locals.user) return { ok: false, status: 401, response: problem(401, 'unauthenticated', 'Sign in first') };
	const teamId = parseUuid(teamIdParam);
	const membership = teamId ? await findMembership(locals.db, teamId, locals.user.id) : undefined;
	if (!membership) return { ok: false, status: 404, response: problem(404, 'not_found', 'No such team') };
	if (!roleAtLeast(membership.role, min)) {
		return { ok: false, status: 403, response: problem(403, 'forbidden', `This needs the ${min} role; you are ${membership.role === 'viewer' ? 'a viewer' : `a ${membership.role}`}`) };
	}
	return { ok: true, access: { teamId: membership.team_id, teamName: membership.team_name, userId: membership.user_id, role: membership.role } };
}
