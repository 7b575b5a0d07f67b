import type { APIRoute } from 'astro';
import { newRunSchema, runListQuerySchema } from '@/lib/schemas/runs';
import { requireTeamRole, resolveRunLinks } from '@/lib/server/access';
import { offsetMinutesOf } from '@/lib/schemas/runs';
import {
	findLikelyDuplicate,
	findRun,
	findRunByClientKey,
	findRuns,
	insertRun,
} from '@/lib/server/db/runs';
import { problem, readJson, readQuery } from '@/lib/server/http';

export const GET: APIRoute = async ({ params, locals, url }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const query = readQuery(url, runListQuerySchema);
	if (!query.ok) return query.response;
	return Response.json(await findRuns(locals.db, auth.value.teamId, query.data));
};

/**
 * Logs a run; the revision in force at its time is linked unless one is given. A client key makes
 * the write idempotent (the same key answers the run it made, 200 instead of 201); a run of the
 * same vehicle in the same second with the same score is refused with 409 `possible_duplicate`
 * unless `allowDuplicate` says the member meant it.
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, newRunSchema);
	if (!body.ok) return body.response;
	const { allowDuplicate, clientKey, ...r } = body.data;
	const teamId = auth.value.teamId;
	const links = await resolveRunLinks(locals.db, teamId, r.vehicleId, r);
	if (!links.ok) return problem(400, 'invalid_input', 'Some links need attention', links.errors);
	if (clientKey) {
		const made = await findRunByClientKey(locals.db, r.vehicleId, clientKey);
		if (made) return Response.json(await findRun(locals.db, teamId, made), { status: 200 });
	}
	if (!allowDuplicate) {
		// A run made with this request's own key is not a duplicate of it: concurrent retries of
		// one run all reach the insert, where the unique index on (vehicle, client key) lets one
		// row in and the others answer it.
		const twin = await findLikelyDuplicate(
			locals.db,
			teamId,
			r.vehicleId,
			r.ranAt,
			r.scoreDb,
			clientKey,
		);
		if (twin)
			return problem(
				409,
				'possible_duplicate',
				'A run of this vehicle at the same second with the same score is already logged',
				undefined,
				{},
				{ existing: twin },
			);
	}
	const made = await insertRun(locals.db, {
		...r,
		ranAtOffsetMin: offsetMinutesOf(r.ranAt),
		clientKey,
		revisionId: links.revisionId ?? null,
		authorId: auth.value.userId,
	});
	return Response.json(await findRun(locals.db, teamId, made.id), {
		status: made.created ? 201 : 200,
	});
};
