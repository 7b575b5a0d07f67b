import type { APIRoute } from 'astro';
import { newRunSchema, runListQuerySchema } from '@/lib/schemas/runs';
import { requireTeamRole, resolveRunLinks } from '@/lib/server/access';
import { findRun, findRuns, insertRun } from '@/lib/server/db/runs';
import { problem, readJson, readQuery } from '@/lib/server/http';

export const GET: APIRoute = async ({ params, locals, url }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const query = readQuery(url, runListQuerySchema);
	if (!query.ok) return query.response;
	return Response.json(await findRuns(locals.db, auth.value.teamId, query.data));
};

/** Logs a run; the revision in force at its time is linked unless one is given. */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, newRunSchema);
	if (!body.ok) return body.response;
	const r = body.data;
	const links = await resolveRunLinks(locals.db, auth.value.teamId, r.vehicleId, r);
	if (!links.ok) return problem(400, 'invalid_input', 'Some links need attention', links.errors);
	const id = await insertRun(locals.db, {
		...r,
		revisionId: links.revisionId ?? null,
		authorId: auth.value.userId,
	});
	return Response.json(await findRun(locals.db, auth.value.teamId, id), { status: 201 });
};
