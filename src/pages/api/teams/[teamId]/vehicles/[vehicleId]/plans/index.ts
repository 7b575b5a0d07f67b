import type { APIRoute } from 'astro';
import { checkTopology } from '@/engine';
import { findHeadRevision, findRevision } from '@/lib/server/db/builds';
import { findPlan, insertPlan, listPlans } from '@/lib/server/db/plans';
import { problem, readJson } from '@/lib/server/http';
import { newPlanSchema } from '@/lib/schemas/plans';
import { requireVehicle } from '@/lib/server/access';

export const GET: APIRoute = async ({ params, locals }) => {
	const found = await requireVehicle(locals, params, 'viewer');
	if (!found.ok) return found.response;
	return Response.json(await listPlans(locals.db, found.value.vehicle.id));
};

/**
 * Starts a plan from a revision (the head when none is named): a copy of its document to change,
 * or the document given (the revision with a calibration's fitted values).
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const found = await requireVehicle(locals, params, 'member');
	if (!found.ok) return found.response;
	const body = await readJson(request, newPlanSchema);
	if (!body.ok) return body.response;
	if (body.data.document) {
		const issues = checkTopology(body.data.document);
		if (issues.length)
			return problem(
				400,
				'invalid_input',
				'The network cannot be solved as drawn',
				issues.map((i) => ({ path: `document.${i.path}`, message: i.message })),
			);
	}
	const { build, vehicle, access } = found.value;
	const base = body.data.fromRevisionId
		? await findRevision(locals.db, build.id, body.data.fromRevisionId)
		: await findHeadRevision(locals.db, build.id);
	if (!base) {
		return body.data.fromRevisionId
			? problem(400, 'invalid_input', 'That revision is not part of this build', [
					{ path: 'fromRevisionId', message: 'No such revision for this vehicle' },
				])
			: problem(
					409,
					'conflict',
					'Save a first revision of the build before planning upgrades to it',
				);
	}
	const id = await insertPlan(locals.db, {
		vehicleId: vehicle.id,
		name: body.data.name,
		notes: body.data.notes,
		baseRevisionId: base.id,
		document: body.data.document ?? base.document,
		createdBy: access.userId,
	});
	return Response.json(await findPlan(locals.db, vehicle.id, id), { status: 201 });
};
