import type { APIRoute } from 'astro';
import { offsetMinutesOf } from '@/lib/schemas/runs';
import { runEngine } from '@/lib/server/engine/pool';
import { updateRunSchema } from '@/lib/schemas/runs';
import { requireRun, resolveRunLinks } from '@/lib/server/access';
import { objectKeysOfRun } from '@/lib/server/db/files';
import { deleteRun, findRun, findSamples, updateRun } from '@/lib/server/db/runs';
import { problem, readJson } from '@/lib/server/http';
import { removeObjects } from '@/lib/server/object-cleanup';

/** A run with its logger samples and their analysis (when a logger file was uploaded). */
export const GET: APIRoute = async ({ params, locals, request }) => {
	const found = await requireRun(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const { run, access } = found.value;
	const samples = await findSamples(locals.db, run.id);
	const analysis = samples.length
		? await runEngine('analyseRun', { samples }, { team: access.teamId, signal: request.signal })
		: null;
	return Response.json({ run, samples, analysis });
};

export const PATCH: APIRoute = async ({ params, request, locals }) => {
	const found = await requireRun(locals, params, 'member');
	if (!found.ok) return found.response;
	const { access, run } = found.value;
	const body = await readJson(request, updateRunSchema);
	if (!body.ok) return body.response;
	const r = body.data;
	const links = await resolveRunLinks(locals.db, access.teamId, run.vehicleId, {
		...r,
		revisionId: r.revisionId ?? (r.ranAt ? undefined : run.revisionId),
	});
	if (!links.ok) return problem(400, 'invalid_input', 'Some links need attention', links.errors);
	await updateRun(locals.db, run.id, {
		...r,
		...(r.ranAt ? { ranAtOffsetMin: offsetMinutesOf(r.ranAt) } : {}),
		revisionId: links.revisionId ?? null,
	});
	return Response.json(await findRun(locals.db, access.teamId, run.id));
};

/** Deletes a run, its samples and its stored files. */
export const DELETE: APIRoute = async ({ params, locals }) => {
	const found = await requireRun(locals, params, 'member');
	if (!found.ok) return found.response;
	const { run } = found.value;
	// Rows first, files after: a store that fails now leaves objects without rows (swept later),
	// never rows without their files.
	const keys = await objectKeysOfRun(locals.db, run.id);
	await deleteRun(locals.db, run.id);
	await removeObjects(locals.storage, keys);
	return new Response(null, { status: 204 });
};
