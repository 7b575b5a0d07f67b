import type { APIRoute } from 'astro';
import { changeRoleSchema } from '@/lib/schemas/account';
import { requireTeamRole } from '@/lib/server/access';
import { changeRole, type MembershipChange, removeMember } from '@/lib/server/db/teams';
import { problem, readJson } from '@/lib/server/http';

function answer(result: MembershipChange): Response {
	if (result.ok) return new Response(null, { status: 204 });
	if (result.reason === 'last_captain')
		return problem(
			409,
			'last_captain',
			'The team needs at least one captain. Make someone else captain first.',
		);
	return problem(404, 'not_found', 'No such member');
}

/** Changes a member's role (captains only). */
export const PATCH: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, changeRoleSchema);
	if (!body.ok) return body.response;
	return answer(
		await changeRole(locals.db, auth.value.teamId, params.userId ?? '', body.data.role),
	);
};

/** Removes a member (captains), or leaves the team (anyone, for themselves). */
export const DELETE: APIRoute = async ({ params, locals }) => {
	const self = locals.user && params.userId === locals.user.id;
	const auth = await requireTeamRole(locals, params.teamId, self ? 'viewer' : 'captain');
	if (!auth.ok) return auth.response;
	return answer(await removeMember(locals.db, auth.value.teamId, params.userId ?? ''));
};
