import type { APIRoute } from 'astro';
import { newVehicleSchema, vehicleListQuerySchema } from '@/lib/schemas/vehicles';
import { requireTeamRole } from '@/lib/server/access';
import { insertVehicleWithBuild, listVehicles, toVehicleDto } from '@/lib/server/db/vehicles';
import { findMembers } from '@/lib/server/db/teams';
import { problem, readJson, readQuery } from '@/lib/server/http';

export const GET: APIRoute = async ({ params, locals, url }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const query = readQuery(url, vehicleListQuerySchema);
	if (!query.ok) return query.response;
	return Response.json(await listVehicles(locals.db, auth.value.teamId, query.data.archived));
};

/** Adds a vehicle (with an empty build) to the team. */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, newVehicleSchema);
	if (!body.ok) return body.response;
	if (
		body.data.ownerId &&
		!(await findMembers(locals.db, auth.value.teamId)).some((m) => m.userId === body.data.ownerId)
	) {
		return problem(400, 'invalid_input', 'The owner must be a member of the team', [
			{ path: 'ownerId', message: 'Not a member of this team' },
		]);
	}
	const { vehicle } = await insertVehicleWithBuild(locals.db, {
		teamId: auth.value.teamId,
		...body.data,
	});
	return Response.json(toVehicleDto(vehicle, null), { status: 201 });
};
