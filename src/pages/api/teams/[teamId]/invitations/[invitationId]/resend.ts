import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/access';
import { findOpenInvitation, renewInvitationToken, toInvitationDto } from '@/lib/server/db/teams';
import { problem } from '@/lib/server/http';
import { sendInvitationMail } from '@/lib/server/invitations';
import { newToken } from '@/lib/server/tokens';

/** Sends a pending invitation again with a new link (the old link stops working) and a new expiry. */
export const POST: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const id = parseUuid(params.invitationId);
	const open = id && (await findOpenInvitation(locals.db, auth.value.teamId, id));
	if (!open) return problem(404, 'not_found', 'No such pending invitation');
	const { token, hash } = newToken();
	const invitation = await renewInvitationToken(locals.db, open.id, hash);
	await sendInvitationMail(locals, auth.value, invitation, token);
	return Response.json(toInvitationDto(invitation));
};
