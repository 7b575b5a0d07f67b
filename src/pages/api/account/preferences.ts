import type { APIRoute } from 'astro';
import { z } from '@/lib/zod';
import { setUnitSystem } from '@/lib/server/db/users';
import { problem, readJson } from '@/lib/server/http';

const preferencesSchema = z.object({
	unitSystem: z.enum(['imperial', 'metric'], { error: 'Units are imperial or metric' }),
});

/** The signed-in person's display preferences (feet/AWG or metres/mm²). */
export const PATCH: APIRoute = async ({ request, locals }) => {
	if (!locals.user) return problem(401, 'unauthenticated', 'Sign in first');
	const body = await readJson(request, preferencesSchema);
	if (!body.ok) return body.response;
	await setUnitSystem(locals.db, locals.user.id, body.data.unitSystem);
	return new Response(null, { status: 204 });
};
