import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { findRevision } from '@/lib/server/db/builds';
import { problem } from '@/lib/server/http';
import { requireVehicle } from '@/lib/server/access';

/** One revision with its build document. */
export const GET: APIRoute = async ({ params, locals }) => {
	const found = await requireVehicle(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const id = parseUuid(params.revisionId);
	const revision = id && (await findRevision(locals.db, found.value.build.id, id));
	if (!revision) return problem(404, 'not_found', 'No such revision');
	return Response.json(revision);
};
