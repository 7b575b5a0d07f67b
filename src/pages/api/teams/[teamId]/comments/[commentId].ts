import type { APIRoute } from 'astro';
import { editCommentSchema, type CommentWriteResult } from '@/lib/schemas/comments';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/access';
import { commentRight, mentionsIn, toCommentDto, withinEditWindow } from '@/lib/server/comments';
import { deleteComment, findComment, updateComment } from '@/lib/server/db/comments';
import { problem, readJson } from '@/lib/server/http';
import { log } from '@/lib/server/log';
import { sendMentionMail } from '@/lib/server/mention-mail';

const TOO_LATE =
	'A comment can be changed or deleted by its author for 15 minutes after writing it';

async function load(params: Record<string, string | undefined>, locals: App.Locals) {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth;
	const id = parseUuid(params.commentId);
	const comment = id ? await findComment(locals.db, auth.value.teamId, id) : undefined;
	if (!comment)
		return { ok: false as const, response: problem(404, 'not_found', 'No such comment') };
	return { ok: true as const, value: { access: auth.value, comment } };
}

/** Changes a comment: its author only, within the window (and while they may still comment). */
export const PATCH: APIRoute = async ({ params, request, locals }) => {
	const found = await load(params, locals);
	if (!found.ok) return found.response;
	const { access, comment } = found.value;
	if (comment.author_id !== access.userId)
		return problem(403, 'forbidden', 'Only its author can change a comment');
	if (!withinEditWindow(comment.created_at)) return problem(403, 'forbidden', TOO_LATE);
	const right = await commentRight(locals.db, access.teamId, access.role);
	if (!right.ok) return problem(403, 'forbidden', right.why);
	const body = await readJson(request, editCommentSchema);
	if (!body.ok) return body.response;
	const mentions = await mentionsIn(locals.db, access.teamId, body.data.body, access.userId);
	const changed = await updateComment(
		locals.db,
		access.teamId,
		comment.id,
		body.data.body,
		mentions.notify.map((m) => m.id),
	);
	if (!changed) return problem(404, 'not_found', 'No such comment');
	if (changed.notifications.length > 0)
		void sendMentionMail(locals.db, locals.mailer, locals.config, changed.notifications).catch(
			(error) => log.warn({ err: error }, 'mention mail not sent; the job retries it'),
		);
	const result: CommentWriteResult = {
		comment: toCommentDto(
			{ ...changed.row, name: locals.user?.name ?? null, email: locals.user?.email ?? null },
			access,
		),
		mentioned: mentions.names,
		unknown: mentions.unknown,
	};
	return Response.json(result);
};

/** Deletes a comment: its author within the window, or a captain at any time (moderation). */
export const DELETE: APIRoute = async ({ params, locals }) => {
	const found = await load(params, locals);
	if (!found.ok) return found.response;
	const { access, comment } = found.value;
	const author = comment.author_id === access.userId;
	if (access.role !== 'captain') {
		if (!author)
			return problem(403, 'forbidden', 'Only its author or a captain can delete a comment');
		if (!withinEditWindow(comment.created_at)) return problem(403, 'forbidden', TOO_LATE);
	}
	if (!(await deleteComment(locals.db, access.teamId, comment.id)))
		return problem(404, 'not_found', 'No such comment');
	return new Response(null, { status: 204 });
};
