import type { APIRoute } from 'astro';
import { newSeasonSchema } from '@/lib/schemas/seasons';
import { requireTeamRole } from '@/lib/server/access';
import { findSeasons, insertSeason } from '@/lib/server/db/seasons';
import { readJson } from '@/lib/server/http';

export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	return Response.json(await findSeasons(locals.db, auth.value.teamId));
};

/** A new season with its budget: the captain sets the money. */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, newSeasonSchema);
	if (!body.ok) return body.response;
	const id = await insertSeason(locals.db, auth.value.teamId, body.data);
	return Response.json({ id, ...body.data, spentMinor: 0 }, { status: 201 });
};
