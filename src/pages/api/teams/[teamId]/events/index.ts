import type { APIRoute } from 'astro';
import { newEventSchema } from '@/lib/schemas/events';
import { requireTeamRole } from '@/lib/server/authz';
import { findEvents } from '@/lib/server/db/runs';
import { readJson } from '@/lib/server/http';

export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	return Response.json(await findEvents(locals.db, auth.access.teamId));
};

export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, newEventSchema);
	if (!body.ok) return body.response;
	const e = body.data;
	const row = await locals.db
		.insertInto('event')
		.values({ team_id: auth.access.teamId, name: e.name, starts_on: e.startsOn, ends_on: e.endsOn, place: e.place, format: e.format, notes: e.notes })
		.returning('id')
		.executeTakeFirstOrThrow();
	return Response.json({ id: row.id, ...e }, { status: 201 });
};
