import type { APIRoute } from 'astro';
import { newRunSchema, runPageQuerySchema } from '@/lib/schemas/runs';
import { requireTeamRole, resolveRunLinks } from '@/lib/server/access';
import { offsetMinutesOf } from '@/lib/schemas/runs';
import {
	findLikelyDuplicate,
	findRun,
	findRunByClientKey,
	findRunsPage,
	insertRun,
} from '@/lib/server/db/runs';
import { problem, readJson, readQuery } from '@/lib/server/http';

/**
 * The team's runs (of a vehicle or an event when asked), oldest first, a page at a time: the newest
 * `limit` (500 at most), with `Link: <…?before=…>; rel="next"` while older runs remain.
 */
export const GET: APIRoute = async ({ params, locals, url }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const query = readQuery(url, runPageQuerySchema);
	if (!query.ok) return query.response;
	const { runs, more } = await findRunsPage(locals.db, auth.value.teamId, query.data);
	const headers = new Headers();
	if (more && runs[0]) {
		const next = new URL(url);
		next.searchParams.set('before', runs[0].ranAt);
		next.searchParams.set('beforeId', runs[0].id);
		next.searchParams.set('limit', String(query.data.limit));
		headers.set('link', `<${next.pathname}${next.search}>; rel="next"`);
	}
	return Response.json(runs, { headers });
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
