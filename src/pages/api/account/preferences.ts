import type { APIRoute } from 'astro';
import { z } from '@/lib/zod';
import { mailChoiceSchema } from '@/lib/schemas/comments';
import { setMentionMail } from '@/lib/server/db/notifications';
import { setUnitSystem } from '@/lib/server/db/users';
import { problem, readJson } from '@/lib/server/http';

const preferencesSchema = z
	.object({
		unitSystem: z
			.enum(['imperial', 'metric'], { error: 'Units are imperial or metric' })
			.optional(),
		/** How mentions reach this person by e-mail: at once, in a daily digest, or not at all. */
		mentionMail: mailChoiceSchema.optional(),
	})
	.refine((v) => v.unitSystem !== undefined || v.mentionMail !== undefined, {
		path: ['unitSystem'],
		message: 'Nothing to change: send unitSystem or mentionMail',
	});

/** The signed-in person's preferences: units (feet/AWG or metres/mm²) and how mentions are mailed. */
export const PATCH: APIRoute = async ({ request, locals }) => {
	if (!locals.user) return problem(401, 'unauthenticated', 'Sign in first');
	const body = await readJson(request, preferencesSchema);
	if (!body.ok) return body.response;
	if (body.data.unitSystem) await setUnitSystem(locals.db, locals.user.id, body.data.unitSystem);
	if (body.data.mentionMail) await setMentionMail(locals.db, locals.user.id, body.data.mentionMail);
	return new Response(null, { status: 204 });
};
