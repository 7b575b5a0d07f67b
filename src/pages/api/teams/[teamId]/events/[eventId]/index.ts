import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { updateEventSchema } from '@/lib/schemas/events';
import { requireTeamRole } from '@/lib/server/authz';
import { findEvent } from '@/lib/server/db/runs';
import { problem, readJson } from '@/lib/server/http';

export const PATCH: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const id = parseUuid(params.eventId);
	const event = id && (await findEvent(locals.db, auth.access.teamId, id));
	if (!event) return problem(404, 'not_found', 'No such event');
	const body = await readJson(request, updateEventSchema);
	if (!body.ok) return body.response;
	const { startsOn, endsOn, ...rest } = body.data;
	if ((endsOn ?? event.ends_on) < (startsOn ?? event.starts_on)) {
		return problem(400, 'invalid_input', 'The event cannot end before it starts', [{ path: 'endsOn', message: 'Before the start' }]);
	}
	await locals.db
		.updateTable('event')
		.set({ ...rest, ...(startsOn ? { starts_on: startsOn } : {}), ...(endsOn ? { ends_on: endsOn } : {}) })
		.where('id', '=', event.id)
		.execute();
	return new Response(null, { status: 204 });
};

/** Deleting an event keeps its runs (they lose the event link). Captains only. */
export const DELETE: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const id = parseUuid(params.eventId);
	const event = id && (await findEvent(locals.db, auth.access.teamId, id));
	if (!event) return problem(404, 'not_found', 'No such event');
	await locals.db.deleteFrom('event').where('id', '=', event.id).execute();
	return new Response(null, { status: 204 });
};
