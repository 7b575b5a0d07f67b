import type { APIRoute } from 'astro';
import { acceptInvitation } from '@/lib/server/db/teams';
import { problem } from '@/lib/server/http';
import { hashToken } from '@/lib/server/tokens';

/** Joins the team of an invitation: signed in, with the invited address, once, before it expires. */
export const POST: APIRoute = async ({ params, locals }) => {
	if (!locals.user) return problem(401, 'unauthenticated', 'Sign in or create an account first');
	const token = params.token ?? '';
	if (token.length < 20 || token.length > 200)
		return problem(404, 'invalid_token', 'This invitation link is not valid');
	const result = await acceptInvitation(locals.db, hashToken(token), locals.user);
	if (result.ok) return Response.json({ teamId: result.teamId, role: result.role });
	switch (result.reason) {
		case 'expired':
			return problem(
				410,
				'token_expired',
				'This invitation has expired. Ask the captain to send it again.',
			);
		case 'used':
			return problem(410, 'token_used', 'This invitation was already used.');
		case 'revoked':
			return problem(410, 'token_used', 'This invitation was withdrawn by the team.');
		case 'email_mismatch':
			return problem(
				403,
				'email_mismatch',
				'This invitation is for another e-mail address. Sign in with the address it was sent to.',
			);
		default:
			return problem(404, 'invalid_token', 'This invitation link is not valid');
	}
};
