import type { APIRoute } from 'astro';
import { newEventSchema } from '@/lib/schemas/events';
import { requireTeamRole } from '@/lib/server/access';
import { findEvents, insertEvent } from '@/lib/server/db/events';
import { readJson } from '@/lib/server/http';

export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	return Response.json(await findEvents(locals.db, auth.value.teamId));
};

export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, newEventSchema);
	if (!body.ok) return body.response;
	const e = body.data;
	const id = await insertEvent(locals.db, auth.value.teamId, e);
	return Response.json({ id, ...e }, { status: 201 });
};
