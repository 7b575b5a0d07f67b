import type { APIRoute } from 'astro';
import { signUpSchema } from '@/lib/schemas/account';
import { registerAccount, registerProblem } from '@/lib/server/accounts';
import { readJson } from '@/lib/server/http';
import { currentClient } from '@/lib/server/request-context';

/** Creates an account with e-mail and password. The client then signs in through Auth.js. */
export const POST: APIRoute = async ({ request, locals }) => {
	const body = await readJson(request, signUpSchema);
	if (!body.ok) return body.response;
	const result = await registerAccount(locals.db, body.data, currentClient());
	if (!result.ok) return registerProblem(result);
	return Response.json(result.user, { status: 201 });
};
