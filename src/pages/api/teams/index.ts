import type { APIRoute } from 'astro';
import { newTeamSchema } from '@/lib/schemas/account';
import { findTeamsForUser, insertTeamWithCaptain } from '@/lib/server/db/teams';
import { problem, readJson } from '@/lib/server/http';

export const GET: APIRoute = async ({ locals }) => {
	if (!locals.user) return problem(401, 'unauthenticated', 'Sign in first');
	return Response.json(await findTeamsForUser(locals.db, locals.user.id));
};

/** Creates a team; its creator becomes captain. */
export const POST: APIRoute = async ({ request, locals }) => {
	if (!locals.user) return problem(401, 'unauthenticated', 'Sign in first');
	const body = await readJson(request, newTeamSchema);
	if (!body.ok) return body.response;
	const team = await insertTeamWithCaptain(locals.db, body.data.name, locals.user.id);
	return Response.json({ ...team, role: 'captain' }, { status: 201 });
};
