import type { InvitationRow } from '@/lib/server/db/schema';
import type { TeamAccess } from '@/lib/server/access';
import { findInvitationByTokenHash } from './db/teams';
import { invitationMail } from './mail-templates';
import { hashToken } from './tokens';

/** Sends (or re-sends) the invitation mail with a freshly issued raw token. */
export async function sendInvitationMail(
	locals: Pick<App.Locals, 'mailer' | 'config' | 'user'>,
	access: TeamAccess,
	invitation: InvitationRow,
	token: string,
) {
	await locals.mailer.send(
		invitationMail({
			to: invitation.email,
			teamName: access.teamName,
			role: invitation.role,
			inviterName: locals.user?.name ?? locals.user?.email ?? 'A captain',
			url: `${locals.config.publicUrl}/invitations/${token}`,
			expiresAt: invitation.expires_at,
		}),
	);
}

export type InvitationState = 'open' | 'used' | 'revoked' | 'expired';

/** What an invitation link offers (team, role, address, state), for the invitation page. */
export async function describeInvitation(db: App.Locals['db'], token: string | undefined) {
	if (!token || token.length > 200) return null;
	const inv = await findInvitationByTokenHash(db, hashToken(token));
	if (!inv) return null;
	const state: InvitationState = inv.accepted_at
		? 'used'
		: inv.revoked_at
			? 'revoked'
			: inv.expires_at.getTime() < Date.now()
				? 'expired'
				: 'open';
	return {
		teamId: inv.team_id,
		teamName: inv.team_name,
		email: inv.email,
		role: inv.role,
		state,
		expiresAt: inv.expires_at.toISOString(),
	};
}
