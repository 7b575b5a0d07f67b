import type { APIRoute } from 'astro';
import { objectKeysOfRun } from '@/lib/server/db/files';
import { removeObjects } from '@/lib/server/object-cleanup';
import { analyseRun } from '@/engine/run-analysis';
import { updateRunSchema } from '@/lib/schemas/events';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/authz';
import { findRun, findSamples, measurementColumns } from '@/lib/server/db/runs';
import { problem, readJson } from '@/lib/server/http';
import { resolveRunLinks } from '@/lib/server/runs';

async function load(locals: App.Locals, teamId: string, runIdParam: string | undefined) {
	const id = parseUuid(runIdParam);
	return id ? findRun(locals.db, teamId, id) : undefined;
}

/** A run with its logger samples and their analysis (when a logger file was uploaded). */
export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const run = await load(locals, auth.access.teamId, params.runId);
	if (!run) return problem(404, 'not_found', 'No such run');
	const samples = await findSamples(locals.db, run.id);
	return Response.json({ run, samples, analysis: samples.length ? analyseRun(samples) : null });
};

export const PATCH: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const run = await load(locals, auth.access.teamId, params.runId);
	if (!run) return problem(404, 'not_found', 'No such run');
	const body = await readJson(request, updateRunSchema);
	if (!body.ok) return body.response;
	const r = body.data;
	const links = await resolveRunLinks(locals.db, auth.access.teamId, run.vehicleId, { ...r, revisionId: r.revisionId ?? (r.ranAt ? undefined : run.revisionId) });
	if (!links.ok) return problem(400, 'invalid_input', 'Some links need attention', links.errors);
	await locals.db
		.updateTable('run')
		.set({
			...(r.eventId !== undefined ? { event_id: r.eventId } : {}),
			...(r.ranAt ? { ran_at: r.ranAt } : {}),
			revision_id: links.revisionId ?? null,
			...measurementColumns(r),
		})
		.where('id', '=', run.id)
		.execute();
	return Response.json(await findRun(locals.db, auth.access.teamId, run.id));
};

/** Deletes a run, its samples and its stored files (files in storage first). */
export const DELETE: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const run = await load(locals, auth.access.teamId, params.runId);
	if (!run) return problem(404, 'not_found', 'No such run');
	// Rows first, files after: a store that fails now leaves objects without rows (swept later),
	// never rows without their files.
	const keys = await objectKeysOfRun(locals.db, run.id);
	await locals.db.deleteFrom('run').where('id', '=', run.id).execute();
	await removeObjects(locals.storage, keys);
	return new Response(null, { status: 204 });
};
