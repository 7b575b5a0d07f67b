import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import type { SignUpInput } from '@/lib/schemas/account';
import { insertUser } from './db/users';
import { type FieldError, problem } from './http';
import { hashPassword } from './passwords';
import { takeRateSlot } from './rate-limit';

export type RegisterResult =
	| { ok: true; user: { id: string; email: string; name: string | null } }
	| { ok: false; status: 409 | 429; detail: string; errors?: FieldError[] };

/**
 * A new account with e-mail and password, limited per address and per client. The address is not
 * confirmed yet: the first sign-in by e-mailed link (or a password reset) confirms it, and drops
 * this password if it was set by someone else.
 */
export async function registerAccount(
	db: Kysely<Database>,
	input: SignUpInput,
	client: string,
): Promise<RegisterResult> {
	if (!(await takeRateSlot(db, 'sign_up', input.email, client))) {
		return {
			ok: false,
			status: 429,
			detail: 'Too many sign-ups for this address or from here. Wait an hour and try again.',
		};
	}
	const user = await insertUser(db, {
		email: input.email,
		name: input.name,
		passwordHash: await hashPassword(input.password),
	});
	if (!user) {
		return {
			ok: false,
			status: 409,
			detail: 'An account with this e-mail address already exists. Sign in, or reset the password.',
			errors: [{ path: 'email', message: 'This address already has an account' }],
		};
	}
	return { ok: true, user: { id: user.id, email: user.email, name: user.name } };
}

export const registerProblem = (r: RegisterResult & { ok: false }) =>
	r.status === 429
		? problem(429, 'rate_limited', r.detail, undefined, { 'retry-after': '3600' })
		: problem(409, 'email_taken', r.detail, r.errors);
