import type { APIRoute } from 'astro';
import { z } from '@/lib/zod';
import { WAIVER_MIN_CHARS } from '@/lib/schemas/checklist';
import { lineText, notesText } from '@/lib/schemas/text';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole, roleAtLeast } from '@/lib/server/access';
import { loadChecklist } from '@/lib/server/checklist';
import { removeSignoff, upsertSignoff } from '@/lib/server/db/checklists';
import { findUserById } from '@/lib/server/db/users';
import { problem, readJson, readQuery } from '@/lib/server/http';

const vehicleQuery = z.object({ vehicleId: z.uuid({ error: 'Choose a vehicle' }) });
const signoffSchema = z.object({
	vehicleId: z.uuid(),
	itemKey: lineText(100, { required: 'Name the item' }),
	note: notesText(500).default(''),
	signed: z.boolean(),
	/**
	 * The revision and the item's status the member saw when signing (a sheet kept on a phone may
	 * be old): when either differs from today's, the sign-off is refused with the current sheet.
	 */
	seen: z
		.object({
			revisionId: z.uuid().nullable(),
			status: z.enum(['pass', 'fail', 'open']),
		})
		.optional(),
});

async function unitsOf(locals: App.Locals) {
	return (locals.user && (await findUserById(locals.db, locals.user.id)))?.unitSystem ?? 'imperial';
}

/** The vehicle's pre-event checklist for the event. */
export const GET: APIRoute = async ({ params, locals, url }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const q = readQuery(url, vehicleQuery);
	if (!q.ok) return q.response;
	const eventId = parseUuid(params.eventId);
	const list =
		eventId &&
		(await loadChecklist(
			locals.db,
			auth.value.teamId,
			eventId,
			q.data.vehicleId,
			await unitsOf(locals),
		));
	if (!list) return problem(404, 'not_found', 'No such event or vehicle');
	return Response.json(list);
};

/**
 * Signs an item off (or withdraws the sign-off) with the member's name and the time. A failing
 * computed item can only be waived: by a captain, with a written reason.
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, signoffSchema);
	if (!body.ok) return body.response;
	const eventId = parseUuid(params.eventId);
	const units = await unitsOf(locals);
	const list =
		eventId &&
		(await loadChecklist(locals.db, auth.value.teamId, eventId, body.data.vehicleId, units));
	if (!list) return problem(404, 'not_found', 'No such event or vehicle');
	const item = list.items.find((i) => i.key === body.data.itemKey);
	if (!item)
		return problem(400, 'invalid_input', 'No such checklist item', [
			{ path: 'itemKey', message: 'Unknown item' },
		]);
	const { seen } = body.data;
	if (seen && (seen.revisionId !== (list.revision?.id ?? null) || seen.status !== item.status))
		return problem(
			409,
			'conflict',
			`The checklist changed since it was opened: "${item.label}" now ${item.status === 'fail' ? 'fails' : item.status === 'pass' ? 'passes' : 'waits for a check'} on ${list.revision ? `revision r${list.revision.number}` : 'no revision'}. Look at it again before signing.`,
			undefined,
			{},
			{ current: list },
		);
	const where = { eventId: list.eventId, vehicleId: list.vehicleId, itemKey: item.key };
	if (!body.data.signed) {
		// A waiver is a captain's decision: only a captain takes it back.
		if (item.signoff?.waived && !roleAtLeast(auth.value.role, 'captain'))
			return problem(403, 'forbidden', 'Only a captain can withdraw a captain’s waiver.');
		await removeSignoff(locals.db, where);
	} else {
		const waiver = item.kind === 'computed' && item.status === 'fail';
		if (waiver && !roleAtLeast(auth.value.role, 'captain'))
			return problem(
				403,
				'forbidden',
				'A failing item can only be waived by a captain, with a written reason.',
			);
		if (waiver && body.data.note.trim().length < WAIVER_MIN_CHARS)
			return problem(400, 'invalid_input', 'Say why the failing item is accepted', [
				{
					path: 'note',
					message: `Write the reason for the waiver (at least ${WAIVER_MIN_CHARS} characters)`,
				},
			]);
		await upsertSignoff(locals.db, {
			...where,
			signedBy: auth.value.userId,
			note: body.data.note,
			waived: waiver,
			// What the sign-off was given on, and for a waiver what it accepts: a later revision that
			// makes the item worse re-opens it.
			revisionId: list.revision?.id ?? null,
			waivedValue: waiver ? (item.measure?.value ?? null) : null,
			waivedReasons: waiver ? item.reasons : null,
		});
	}
	return Response.json(
		await loadChecklist(locals.db, auth.value.teamId, list.eventId, list.vehicleId, units),
	);
};
