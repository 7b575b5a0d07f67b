import type { APIRoute } from 'astro';
import { requireTeamRole } from '@/lib/server/access';
import { findMembers } from '@/lib/server/db/teams';

export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	return Response.json(await findMembers(locals.db, auth.value.teamId));
};
