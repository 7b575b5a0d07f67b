import type { APIRoute } from 'astro';
import { z } from 'zod';
import { lineText, notesText } from '@/lib/schemas/text';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/access';
import { loadChecklist } from '@/lib/server/checklist';
import { removeSignoff, upsertSignoff } from '@/lib/server/db/checklists';
import { problem, readJson, readQuery } from '@/lib/server/http';

const vehicleQuery = z.object({ vehicleId: z.uuid({ error: 'Choose a vehicle' }) });
const signoffSchema = z.object({
	vehicleId: z.uuid(),
	itemKey: lineText(100, { required: 'Name the item' }),
	note: notesText(500).default(''),
	signed: z.boolean(),
});

/** The vehicle's pre-event checklist for the event. */
export const GET: APIRoute = async ({ params, locals, url }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const q = readQuery(url, vehicleQuery);
	if (!q.ok) return q.response;
	const eventId = parseUuid(params.eventId);
	const list =
		eventId && (await loadChecklist(locals.db, auth.value.teamId, eventId, q.data.vehicleId));
	if (!list) return problem(404, 'not_found', 'No such event or vehicle');
	return Response.json(list);
};

/** Signs an item off (or withdraws the sign-off) with the member's name and the time. */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, signoffSchema);
	if (!body.ok) return body.response;
	const eventId = parseUuid(params.eventId);
	const list =
		eventId && (await loadChecklist(locals.db, auth.value.teamId, eventId, body.data.vehicleId));
	if (!list) return problem(404, 'not_found', 'No such event or vehicle');
	if (!list.items.some((i) => i.key === body.data.itemKey))
		return problem(400, 'invalid_input', 'No such checklist item', [
			{ path: 'itemKey', message: 'Unknown item' },
		]);
	if (body.data.signed) {
		await upsertSignoff(locals.db, {
			eventId: list.eventId,
			vehicleId: list.vehicleId,
			itemKey: body.data.itemKey,
			signedBy: auth.value.userId,
			note: body.data.note,
		});
	} else {
		await removeSignoff(locals.db, {
			eventId: list.eventId,
			vehicleId: list.vehicleId,
			itemKey: body.data.itemKey,
		});
	}
	return Response.json(
		await loadChecklist(locals.db, auth.value.teamId, list.eventId, list.vehicleId),
	);
};
