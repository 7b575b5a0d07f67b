import type { APIRoute } from 'astro';
import { newRevisionSchema } from '@/lib/schemas/vehicles';
import { checkTopology } from '@/engine';
import { listRevisions } from '@/lib/server/db/builds';
import { problem, readJson } from '@/lib/server/http';
import { saveRevision } from '@/lib/server/revisions';
import { requireVehicle } from '@/lib/server/access';

export const GET: APIRoute = async ({ params, locals }) => {
	const found = await requireVehicle(locals, params, 'viewer');
	if (!found.ok) return found.response;
	return Response.json(await listRevisions(locals.db, found.value.build.id));
};

/** Saves the draft as a new immutable revision on top of `parentId`. */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const found = await requireVehicle(locals, params, 'member');
	if (!found.ok) return found.response;
	const body = await readJson(request, newRevisionSchema);
	if (!body.ok) return body.response;
	const issues = checkTopology(body.data.document);
	if (issues.length) {
		return problem(
			400,
			'invalid_input',
			'The network cannot be solved as drawn',
			issues.map((i) => ({ path: `document.${i.path}`, message: i.message })),
		);
	}
	return saveRevision(locals.db, {
		buildId: found.value.build.id,
		parentId: body.data.parentId,
		document: body.data.document,
		message: body.data.message,
		authorId: found.value.access.userId,
	});
};
