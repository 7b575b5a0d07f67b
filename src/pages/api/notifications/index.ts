import type { APIRoute } from 'astro';
import type { NotificationsDto } from '@/lib/schemas/comments';
import { authorLabel } from '@/lib/server/db/comments';
import { findNotifications, mentionMailOf, unreadCount } from '@/lib/server/db/notifications';
import { problem } from '@/lib/server/http';

/** The signed-in person's mentions, newest first, from the teams they are in; `?count` only counts. */
export const GET: APIRoute = async ({ url, locals }) => {
	if (!locals.user) return problem(401, 'unauthenticated', 'Sign in first');
	const userId = locals.user.id;
	if (url.searchParams.has('count'))
		return Response.json(
			{ unread: await unreadCount(locals.db, userId) },
			{ headers: { 'cache-control': 'private, no-store' } },
		);
	const [rows, unread, mail] = await Promise.all([
		findNotifications(locals.db, userId),
		unreadCount(locals.db, userId),
		mentionMailOf(locals.db, userId),
	]);
	const dto: NotificationsDto = {
		unread,
		mail,
		items: rows.map((r) => ({
			id: r.id,
			teamId: r.team_id,
			teamName: r.team_name,
			author: authorLabel(r),
			subject: r.place.label,
			href: r.place.href,
			excerpt: r.body.length > 280 ? `${r.body.slice(0, 280)}…` : r.body,
			createdAt: r.created_at.toISOString(),
			read: r.read_at !== null,
		})),
	};
	return Response.json(dto, { headers: { 'cache-control': 'private, no-store' } });
};
