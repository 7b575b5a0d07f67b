import type { AstroGlobal } from 'astro';
import type { Role } from '../../../db/schema';
import { type TeamAccess, requireTeamRole } from './authz';

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
