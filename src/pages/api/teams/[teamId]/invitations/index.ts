import type { APIRoute } from 'astro';
import { newInvitationSchema } from '@/lib/schemas/account';
import { requireTeamRole } from '@/lib/server/access';
import {
	findMembers,
	findPendingInvitations,
	toInvitationDto,
	upsertInvitation,
} from '@/lib/server/db/teams';
import { problem, readJson } from '@/lib/server/http';
import { sendInvitationMail } from '@/lib/server/invitations';
import { newToken } from '@/lib/server/tokens';

export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	return Response.json(await findPendingInvitations(locals.db, auth.value.teamId));
};

/** Invites an address with a role; a second invitation to the same address renews the first. */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, newInvitationSchema);
	if (!body.ok) return body.response;
	const members = await findMembers(locals.db, auth.value.teamId);
	if (members.some((m) => m.email === body.data.email)) {
		return problem(409, 'conflict', 'This person is already in the team', [
			{ path: 'email', message: 'Already a member' },
		]);
	}
	const { token, hash } = newToken();
	const invitation = await upsertInvitation(locals.db, {
		teamId: auth.value.teamId,
		email: body.data.email,
		role: body.data.role,
		invitedBy: auth.value.userId,
		tokenHash: hash,
	});
	await sendInvitationMail(locals, auth.value, invitation, token);
	return Response.json(toInvitationDto(invitation), { status: 201 });
};
