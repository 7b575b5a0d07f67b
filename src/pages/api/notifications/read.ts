import type { APIRoute } from 'astro';
import { markReadSchema } from '@/lib/schemas/comments';
import { markRead, unreadCount } from '@/lib/server/db/notifications';
import { problem, readJson } from '@/lib/server/http';

/** Marks the caller's notifications read: these ids (anyone else's are left alone), or all. */
export const POST: APIRoute = async ({ request, locals }) => {
	if (!locals.user) return problem(401, 'unauthenticated', 'Sign in first');
	const body = await readJson(request, markReadSchema);
	if (!body.ok) return body.response;
	const { ids } = body.data;
	const marked = await markRead(locals.db, locals.user.id, ids ? { ids } : { all: true });
	return Response.json({ marked, unread: await unreadCount(locals.db, locals.user.id) });
};
