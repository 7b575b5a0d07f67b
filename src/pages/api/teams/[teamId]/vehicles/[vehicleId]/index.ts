import type { APIRoute } from 'astro';
import { updateVehicleSchema } from '@/lib/schemas/vehicles';
import { findMembers } from '@/lib/server/db/teams';
import { problem, readJson } from '@/lib/server/http';
import { requireVehicle } from '@/lib/server/access';
import { toVehicleDto, updateVehicle } from '@/lib/server/db/vehicles';

export const GET: APIRoute = async ({ params, locals }) => {
	const found = await requireVehicle(locals, params, 'viewer');
	if (!found.ok) return found.response;
	return Response.json(toVehicleDto(found.value.vehicle, found.value.build.head_revision_id));
};

/** Edits a vehicle's details, or archives / restores it (`archived`). */
export const PATCH: APIRoute = async ({ params, request, locals }) => {
	const found = await requireVehicle(locals, params, 'member');
	if (!found.ok) return found.response;
	const body = await readJson(request, updateVehicleSchema);
	if (!body.ok) return body.response;
	const { ownerId } = body.data;
	if (
		ownerId &&
		!(await findMembers(locals.db, found.value.access.teamId)).some((m) => m.userId === ownerId)
	) {
		return problem(400, 'invalid_input', 'The owner must be a member of the team', [
			{ path: 'ownerId', message: 'Not a member of this team' },
		]);
	}
	const row = await updateVehicle(locals.db, found.value.vehicle.id, body.data);
	return Response.json(toVehicleDto(row, found.value.build.head_revision_id));
};
