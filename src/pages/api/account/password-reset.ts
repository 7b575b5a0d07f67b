import type { APIRoute } from 'astro';
import { passwordResetRequestSchema } from '@/lib/schemas/account';
import { findUserByEmail, insertPasswordReset } from '@/lib/server/db/users';
import { readJson } from '@/lib/server/http';
import { passwordResetMail } from '@/lib/server/mail-templates';
import { newToken } from '@/lib/server/tokens';

export const RESET_TTL_MS = 3600 * 1000;

/** Sends a reset link when the address has an account; answers the same either way (no probing). */
export const POST: APIRoute = async ({ request, locals }) => {
	const body = await readJson(request, passwordResetRequestSchema);
	if (!body.ok) return body.response;
	const user = await findUserByEmail(locals.db, body.data.email);
	if (user) {
		const { token, hash } = newToken();
		await insertPasswordReset(locals.db, user.id, hash, RESET_TTL_MS);
		await locals.mailer.send(passwordResetMail({ to: user.email, url: `${locals.config.publicUrl}/reset-password?token=${token}` }));
	}
	return Response.json({ status: 'sent_if_known' }, { status: 202 });
};
