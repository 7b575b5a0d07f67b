import type { APIRoute } from 'astro';
import { checkTopology } from '@/engine';
import { deletePlan, findPlan, findPlanForPage, updatePlan } from '@/lib/server/db/plans';
import { parseUuid } from '@/lib/schemas/ids';
import { conflict, problem, readJson } from '@/lib/server/http';
import { updatePlanSchema } from '@/lib/schemas/plans';
import { requirePlan, requireVehicle } from '@/lib/server/access';

/**
 * The plan with its document. The document goes out as the database's own JSON text, spliced in:
 * a plan of a thousand cables is never parsed and written again on the server's thread.
 */
export const GET: APIRoute = async ({ params, locals }) => {
	const found = await requireVehicle(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const id = parseUuid(params.planId);
	const row = id && (await findPlanForPage(locals.db, found.value.vehicle.id, id, ALL_PARTS));
	if (!row || row.documentText === null) return problem(404, 'not_found', 'No such plan');
	const rest = JSON.stringify(row.plan);
	return new Response(`${rest.slice(0, -1)},"document":${row.documentText}}`, {
		headers: { 'content-type': 'application/json' },
	});
};

/** Inline every document, however large (the schema's limits keep it bounded). */
const ALL_PARTS = 1_000_000_000;

/** Saves the whole plan (name, notes, document, parts) when the editor's version is still current. */
export const PUT: APIRoute = async ({ params, request, locals }) => {
	const found = await requirePlan(locals, params, 'member');
	if (!found.ok) return found.response;
	const body = await readJson(request, updatePlanSchema);
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
	const { vehicle, plan } = found.value;
	const result = await updatePlan(locals.db, vehicle.id, plan.id, body.data);
	if (!result.ok && result.reason === 'missing') return problem(404, 'not_found', 'No such plan');
	if (!result.ok) {
		const current = await findPlan(locals.db, vehicle.id, plan.id);
		return conflict(
			'Someone saved this plan after you opened it. Your changes are kept: compare and save again.',
			{ current, yours: body.data },
		);
	}
	return Response.json(await findPlan(locals.db, vehicle.id, plan.id));
};

export const DELETE: APIRoute = async ({ params, locals }) => {
	const found = await requirePlan(locals, params, 'member');
	if (!found.ok) return found.response;
	await deletePlan(locals.db, found.value.vehicle.id, found.value.plan.id);
	return new Response(null, { status: 204 });
};
