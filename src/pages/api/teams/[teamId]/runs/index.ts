import type { APIRoute } from 'astro';
import { newRunSchema } from '@/lib/schemas/events';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/authz';
import { findRun, findRuns, measurementColumns } from '@/lib/server/db/runs';
import { problem, readJson } from '@/lib/server/http';
import { resolveRunLinks } from '@/lib/server/runs';

export const GET: APIRoute = async ({ params, locals, url }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const vehicleId = parseUuid(url.searchParams.get('vehicleId')) ?? undefined;
	const eventId = parseUuid(url.searchParams.get('eventId')) ?? undefined;
	return Response.json(await findRuns(locals.db, auth.access.teamId, { vehicleId, eventId }));
};

/** Logs a run; the revision in force at its time is linked unless one is given. */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, newRunSchema);
	if (!body.ok) return body.response;
	const r = body.data;
	const links = await resolveRunLinks(locals.db, auth.access.teamId, r.vehicleId, r);
	if (!links.ok) return problem(400, 'invalid_input', 'Some links need attention', links.errors);
	const row = await locals.db
		.insertInto('run')
		.values({
			vehicle_id: r.vehicleId,
			event_id: r.eventId,
			revision_id: links.revisionId ?? null,
			ran_at: r.ranAt,
			...measurementColumns(r),
			author_id: auth.access.userId,
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	return Response.json(await findRun(locals.db, auth.access.teamId, row.id), { status: 201 });
};
