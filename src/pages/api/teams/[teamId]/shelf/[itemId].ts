import type { APIRoute } from 'astro';
import { shelfItemUpdateSchema } from '@/lib/schemas/shelf';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/access';
import { deleteShelfItem, findShelfItem, updateShelfItem } from '@/lib/server/db/shelf';
import { conflict, problem, readJson } from '@/lib/server/http';

const notFound = () => problem(404, 'not_found', 'No such shelf entry in this team');

/** Replaces an entry, if nobody saved it since the member read it (409 with the saved one otherwise). */
export const PUT: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const id = parseUuid(params.itemId);
	if (!id) return notFound();
	const body = await readJson(request, shelfItemUpdateSchema);
	if (!body.ok) return body.response;
	const teamId = auth.value.teamId;
	const result = await updateShelfItem(locals.db, teamId, id, body.data.updatedAt, body.data.item);
	if (result === null) return notFound();
	if (result === 'stale')
		return conflict('Someone saved this entry since you opened it', {
			current: await findShelfItem(locals.db, teamId, id),
		});
	return Response.json(result);
};

export const DELETE: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const id = parseUuid(params.itemId);
	if (!id || !(await deleteShelfItem(locals.db, auth.value.teamId, id))) return notFound();
	return new Response(null, { status: 204 });
};
