import type { APIRoute } from 'astro';
import { passwordResetRequestSchema } from '@/lib/schemas/account';
import { findUserByEmail, insertPasswordReset } from '@/lib/server/db/users';
import { problem, readJson } from '@/lib/server/http';
import { passwordResetMail } from '@/lib/server/mail-templates';
import { takeRateSlot } from '@/lib/server/rate-limit';
import { currentClient } from '@/lib/server/request-context';
import { newToken } from '@/lib/server/tokens';
import { errorField, log } from '@/lib/server/log';

export const RESET_TTL_MS = 3600 * 1000;

/**
 * Sends a reset link when the address has an account, and answers the same either way, in the
 * same time: the lookup and the mail happen after the answer, so a known address is not slower
 * than an unknown one. Limited per address and per client.
 */
export const POST: APIRoute = async ({ request, locals }) => {
	const body = await readJson(request, passwordResetRequestSchema);
	if (!body.ok) return body.response;
	const email = body.data.email;
	if (!(await takeRateSlot(locals.db, 'reset_mail', email, currentClient()))) {
		return problem(
			429,
			'rate_limited',
			'Too many reset requests for this address or from here. Wait a quarter of an hour and try again.',
			undefined,
			{ 'retry-after': '900' },
		);
	}
	const { db, mailer, config } = locals;
	void (async () => {
		const user = await findUserByEmail(db, email);
		if (!user) return;
		const { token, hash } = newToken();
		await insertPasswordReset(db, user.id, hash, RESET_TTL_MS);
		await mailer.send(
			passwordResetMail({
				to: user.email,
				url: `${config.publicUrl}/reset-password?token=${token}`,
			}),
		);
	})().catch((error: unknown) =>
		log.error({ err: errorField(error) }, 'password reset mail failed'),
	);
	return Response.json({ status: 'sent_if_known' }, { status: 202 });
};
