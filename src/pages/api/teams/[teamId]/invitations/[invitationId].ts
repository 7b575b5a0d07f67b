import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/access';
import { findOpenInvitation, revokeInvitation } from '@/lib/server/db/teams';
import { problem } from '@/lib/server/http';

/** Revokes a pending invitation: its link stops working. */
export const DELETE: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const id = parseUuid(params.invitationId);
	const invitation = id && (await findOpenInvitation(locals.db, auth.value.teamId, id));
	if (!invitation) return problem(404, 'not_found', 'No such pending invitation');
	await revokeInvitation(locals.db, invitation.id);
	return new Response(null, { status: 204 });
};
