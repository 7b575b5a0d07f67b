import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { restoreRevisionSchema } from '@/lib/schemas/vehicles';
import { findRevision } from '@/lib/server/db/builds';
import { problem, readJson } from '@/lib/server/http';
import { saveRevision } from '@/lib/server/revisions';
import { requireVehicle } from '@/lib/server/access';

/** Restores an old revision as a new one on top of the head (history is never rewritten). */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const found = await requireVehicle(locals, params, 'member');
	if (!found.ok) return found.response;
	const id = parseUuid(params.revisionId);
	const old = id && (await findRevision(locals.db, found.value.build.id, id));
	if (!old) return problem(404, 'not_found', 'No such revision');
	const body = await readJson(request, restoreRevisionSchema);
	if (!body.ok) return body.response;
	return saveRevision(locals.db, {
		buildId: found.value.build.id,
		parentId: body.data.parentId,
		document: old.document,
		message: body.data.message ?? `Restore revision ${old.number}: ${old.message}`,
		authorId: found.value.access.userId,
		restoredFromId: old.id,
	});
};
