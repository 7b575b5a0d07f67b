import type { Role } from '@/lib/server/db/schema';
import { parseUuid } from '../schemas/ids';
import { type TeamAccess, requireTeamRole } from './authz';
import { findBuildForVehicle, findRevision, findVehicle } from './db/builds';
import { findPlan } from './db/plans';
import { problem } from './http';

export interface VehicleAccess {
	access: TeamAccess;
	vehicle: NonNullable<Awaited<ReturnType<typeof findVehicle>>>;
	build: NonNullable<Awaited<ReturnType<typeof findBuildForVehicle>>>;
}

/** Team role check, then the vehicle (and its build) inside that team; anything else is a 404. */
export async function requireVehicle(
	locals: Pick<App.Locals, 'db' | 'user'>,
	params: Record<string, string | undefined>,
	min: Role,
): Promise<{ ok: true; value: VehicleAccess } | { ok: false; response: Response }> {
	const auth = await requireTeamRole(locals, params.teamId, min);
	if (!auth.ok) return auth;
	const vehicleId = parseUuid(params.vehicleId);
	const vehicle = vehicleId ? await findVehicle(locals.db, auth.access.teamId, vehicleId) : undefined;
	const build = vehicle ? await findBuildForVehicle(locals.db, vehicle.id) : undefined;
	if (!vehicle || !build) return { ok: false, response: problem(404, 'not_found', 'No such vehicle') };
	return { ok: true, value: { access: auth.access, vehicle, build } };
}

/** requireVehicle, then the revision named in the URL, parsing the scenario query when asked. */
export async function requireRevision(locals: Pick<App.Locals, 'db' | 'user'>, params: Record<string, string | undefined>, min: Role) {
	const found = await requireVehicle(locals, params, min);
	if (!found.ok) return found;
	const id = parseUuid(params.revisionId);
	const revision = id && (await findRevision(locals.db, found.value.build.id, id));
	if (!revision) return { ok: false as const, response: problem(404, 'not_found', 'No such revision') };
	return { ok: true as const, value: { ...found.value, revision } };
}

/** requireVehicle, then the plan named in the URL (a plan of another vehicle is a 404). */
export async function requirePlan(locals: Pick<App.Locals, 'db' | 'user'>, params: Record<string, string | undefined>, min: Role) {
	const found = await requireVehicle(locals, params, min);
	if (!found.ok) return found;
	const id = parseUuid(params.planId);
	const plan = id && (await findPlan(locals.db, found.value.vehicle.id, id));
	if (!plan) return { ok: false as const, response: problem(404, 'not_found', 'No such plan') };
	return { ok: true as const, value: { ...found.value, plan } };
}
