import type { APIRoute } from 'astro';
import { updateEventSchema } from '@/lib/schemas/events';
import { requireEvent } from '@/lib/server/access';
import { deleteEvent, updateEvent } from '@/lib/server/db/events';
import { problem, readJson } from '@/lib/server/http';

export const PATCH: APIRoute = async ({ params, request, locals }) => {
	const found = await requireEvent(locals, params, 'member');
	if (!found.ok) return found.response;
	const { event } = found.value;
	const body = await readJson(request, updateEventSchema);
	if (!body.ok) return body.response;
	if ((body.data.endsOn ?? event.ends_on) < (body.data.startsOn ?? event.starts_on)) {
		return problem(400, 'invalid_input', 'The event cannot end before it starts', [
			{ path: 'endsOn', message: 'Before the start' },
		]);
	}
	await updateEvent(locals.db, event.id, body.data);
	return new Response(null, { status: 204 });
};

/** Deleting an event keeps its runs (they lose the event link). Captains only. */
export const DELETE: APIRoute = async ({ params, locals }) => {
	const found = await requireEvent(locals, params, 'captain');
	if (!found.ok) return found.response;
	await deleteEvent(locals.db, found.value.event.id);
	return new Response(null, { status: 204 });
};
