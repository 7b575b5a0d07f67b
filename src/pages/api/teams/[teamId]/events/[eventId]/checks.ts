import type { APIRoute } from 'astro';
import { z } from 'zod';
import { lineText, notesText } from '@/lib/schemas/text';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/authz';
import { loadChecklist } from '@/lib/server/checks';
import { problem, readJson, readQuery } from '@/lib/server/http';

const vehicleQuery = z.object({ vehicleId: z.uuid({ error: 'Choose a vehicle' }) });
const signoffSchema = z.object({ vehicleId: z.uuid(), itemKey: lineText(100, { required: 'Name the item' }), note: notesText(500).default(''), signed: z.boolean() });

/** The vehicle's pre-event checklist for the event. */
export const GET: APIRoute = async ({ params, locals, url }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const q = readQuery(url, vehicleQuery);
	if (!q.ok) return q.response;
	const eventId = parseUuid(params.eventId);
	const list = eventId && (await loadChecklist(locals.db, auth.access.teamId, eventId, q.data.vehicleId));
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
	const list = eventId && (await loadChecklist(locals.db, auth.access.teamId, eventId, body.data.vehicleId));
	if (!list) return problem(404, 'not_found', 'No such event or vehicle');
	if (!list.items.some((i) => i.key === body.data.itemKey)) return problem(400, 'invalid_input', 'No such checklist item', [{ path: 'itemKey', message: 'Unknown item' }]);
	if (body.data.signed) {
		await locals.db
			.insertInto('check_signoff')
			.values({ event_id: list.eventId, vehicle_id: list.vehicleId, item_key: body.data.itemKey, signed_by: auth.access.userId, note: body.data.note })
			.onConflict((oc) => oc.columns(['event_id', 'vehicle_id', 'item_key']).doUpdateSet({ signed_by: auth.access.userId, signed_at: new Date(), note: body.data.note }))
			.execute();
	} else {
		await locals.db.deleteFrom('check_signoff').where('event_id', '=', list.eventId).where('vehicle_id', '=', list.vehicleId).where('item_key', '=', body.data.itemKey).execute();
	}
	return Response.json(await loadChecklist(locals.db, auth.access.teamId, list.eventId, list.vehicleId));
};
