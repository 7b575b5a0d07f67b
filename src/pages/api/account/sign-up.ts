import type { APIRoute } from 'astro';
import { signUpSchema } from '@/lib/schemas/account';
import { insertUser } from '@/lib/server/db/users';
import { problem, readJson } from '@/lib/server/http';
import { hashPassword } from '@/lib/server/passwords';

/** Creates an account with e-mail and password. The client then signs in through Auth.js. */
export const POST: APIRoute = async ({ request, locals }) => {
	const body = await readJson(request, signUpSchema);
	if (!body.ok) return body.response;
	const user = await insertUser(locals.db, { email: body.data.email, name: body.data.name, passwordHash: await hashPassword(body.data.password) });
	if (!user) {
		return problem(409, 'email_taken', 'An account with this e-mail address already exists. Sign in, or reset the password.', [
			{ path: 'email', message: 'This address already has an account' },
		]);
	}
	return Response.json({ id: user.id, email: user.email, name: user.name }, { status: 201 });
};
