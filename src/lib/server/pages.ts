import type { AstroGlobal } from 'astro';
import type { Role } from '@/lib/server/db/schema';
import { parseUuid } from '../schemas/ids';
import { type TeamAccess, requireTeamRole } from './authz';
import { findBuildForVehicle, findVehicle } from './db/builds';

/**
 * The page-side twin of requireTeamRole: anonymous → sign-in, not a member → 404 page,
 * wrong role → 403 page. Returns the access, or the Response the page should return.
 */
export async function teamPageAccess(astro: AstroGlobal, min: Role = 'viewer'): Promise<TeamAccess | Response> {
	const result = await requireTeamRole(astro.locals, astro.params.teamId, min);
	if (result.ok) return result.access;
	if (result.status === 401) return astro.redirect(`/sign-in?callbackUrl=${encodeURIComponent(astro.url.pathname)}`);
	if (result.status === 403) {
		astro.response.status = 403;
		return astro.rewrite('/403');
	}
	return astro.rewrite('/404');
}

/** teamPageAccess, then the vehicle of the URL inside that team (and its build), or the 404 page. */
export async function vehiclePageAccess(astro: AstroGlobal, min: Role = 'viewer') {
	const access = await teamPageAccess(astro, min);
	if (access instanceof Response) return access;
	const vehicleId = parseUuid(astro.params.vehicleId);
	const vehicle = vehicleId ? await findVehicle(astro.locals.db, access.teamId, vehicleId) : undefined;
	const build = vehicle ? await findBuildForVehicle(astro.locals.db, vehicle.id) : undefined;
	if (!vehicle || !build) return astro.rewrite('/404');
	return { access, vehicle, build };
}
