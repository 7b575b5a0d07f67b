import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/access';
import { deleteSeason, findSeason } from '@/lib/server/db/seasons';
import { problem } from '@/lib/server/http';
import { removeObjects } from '@/lib/server/object-cleanup';
import { seasonDetail } from '@/lib/server/seasons';

const notFound = () => problem(404, 'not_found', 'No such season in this team');

/** The season with its purchases, who paid what against an even share, and plans committed. */
export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const id = parseUuid(params.seasonId);
	const season = id ? await findSeason(locals.db, auth.value.teamId, id) : null;
	if (!season) return notFound();
	return Response.json(await seasonDetail(locals.db, auth.value.teamId, season));
};

/** Deletes the season and its purchases (captains only). */
export const DELETE: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const id = parseUuid(params.seasonId);
	const receipts = id ? await deleteSeason(locals.db, auth.value.teamId, id) : null;
	if (!receipts) return notFound();
	await removeObjects(locals.storage, receipts);
	return new Response(null, { status: 204 });
};
