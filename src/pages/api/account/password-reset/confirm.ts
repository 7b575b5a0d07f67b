import type { APIRoute } from 'astro';
import { passwordResetConfirmSchema } from '@/lib/schemas/account';
import { resetPassword } from '@/lib/server/db/users';
import { problem, readJson } from '@/lib/server/http';
import { hashPassword } from '@/lib/server/passwords';
import { hashToken } from '@/lib/server/tokens';

/**
 * Sets a new password with a reset token: single use, expiring, in one transaction. The reset ends
 * every older session of the account (someone who knew the old password is signed out) and spends
 * every other open reset link, and confirms the address, since the link came by mail.
 */
export const POST: APIRoute = async ({ request, locals }) => {
	const body = await readJson(request, passwordResetConfirmSchema);
	if (!body.ok) return body.response;
	const passwordHash = await hashPassword(body.data.password);
	const result = await resetPassword(locals.db, hashToken(body.data.token), passwordHash);
	if (!result.ok) {
		if (result.reason === 'expired')
			return problem(410, 'token_expired', 'This reset link has expired. Ask for a new one.');
		if (result.reason === 'used')
			return problem(410, 'token_used', 'This reset link was already used. Ask for a new one.');
		return problem(404, 'invalid_token', 'This reset link is not valid.');
	}
	return new Response(null, { status: 204 });
};
