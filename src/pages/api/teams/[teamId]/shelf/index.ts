import type { APIRoute } from 'astro';
import { shelfItemSchema } from '@/lib/schemas/shelf';
import { requireTeamRole } from '@/lib/server/access';
import { addShelfItems, findShelf, SHELF_LIMIT } from '@/lib/server/db/shelf';
import { problem, readJson } from '@/lib/server/http';

/** The team's parts shelf: every member reads it. */
export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	return Response.json(await findShelf(locals.db, auth.value.teamId), {
		headers: { 'cache-control': 'private, no-store' },
	});
};

/** Adds an entry (members and captains). */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, shelfItemSchema);
	if (!body.ok) return body.response;
	const added = (await addShelfItems(locals.db, auth.value.teamId, [body.data]))?.[0];
	if (!added)
		return problem(
			409,
			'conflict',
			`A shelf holds at most ${SHELF_LIMIT} entries; remove some first`,
		);
	return Response.json(added, { status: 201 });
};
