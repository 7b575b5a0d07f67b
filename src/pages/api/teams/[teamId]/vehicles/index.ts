import type { APIRoute } from 'astro';
import { newVehicleSchema } from '@/lib/schemas/vehicles';
import { requireTeamRole } from '@/lib/server/authz';
import { insertVehicleWithBuild } from '@/lib/server/db/builds';
import { findMembers } from '@/lib/server/db/teams';
import { problem, readJson } from '@/lib/server/http';
import { toVehicleDto } from '@/lib/server/vehicles-dto';

export const GET: APIRoute = async ({ params, locals, url }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const archived = url.searchParams.get('archived') === 'true';
	const rows = await locals.db
		.selectFrom('vehicle as v')
		.innerJoin('build as b', 'b.vehicle_id', 'v.id')
		.selectAll('v')
		.select('b.head_revision_id')
		.where('v.team_id', '=', auth.access.teamId)
		.where('v.archived_at', archived ? 'is not' : 'is', null)
		.orderBy('v.name')
		.execute();
	return Response.json(rows.map((r) => toVehicleDto(r, r.head_revision_id)));
};

/** Adds a vehicle (with an empty build) to the team. */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, newVehicleSchema);
	if (!body.ok) return body.response;
	if (body.data.ownerId && !(await findMembers(locals.db, auth.access.teamId)).some((m) => m.userId === body.data.ownerId)) {
		return problem(400, 'invalid_input', 'The owner must be a member of the team', [{ path: 'ownerId', message: 'Not a member of this team' }]);
	}
	const { vehicle } = await insertVehicleWithBuild(locals.db, { teamId: auth.access.teamId, ...body.data });
	return Response.json(toVehicleDto(vehicle, null), { status: 201 });
};
