import type { APIRoute } from 'astro';
import {
	newCommentSchema,
	threadSubjectSchema,
	type CommentWriteResult,
} from '@/lib/schemas/comments';
import { requireTeamRole } from '@/lib/server/access';
import {
	COMMENT_RATE,
	commentRight,
	mentionsIn,
	threadOf,
	toCommentDto,
} from '@/lib/server/comments';
import { commentsWrittenSince, insertComment, subjectInTeam } from '@/lib/server/db/comments';
import { problem, readJson, readQuery } from '@/lib/server/http';
import { log } from '@/lib/server/log';
import { sendMentionMail } from '@/lib/server/mention-mail';

/** A thread (`?on=revision|run|plan|event&id=…`), oldest first, with whether the caller may write. */
export const GET: APIRoute = async ({ params, url, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const q = readQuery(url, threadSubjectSchema);
	if (!q.ok) return q.response;
	if (!(await subjectInTeam(locals.db, auth.value.teamId, q.data)))
		return problem(404, 'not_found', `No such ${q.data.on} in this team`);
	return Response.json(await threadOf(locals.db, auth.value.teamId, q.data, auth.value));
};

/**
 * Adds a comment; members it mentions are notified in the same transaction, and mailed after it
 * (at once, for those who chose that) without holding the answer up.
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const { teamId, userId } = auth.value;
	const right = await commentRight(locals.db, teamId, auth.value.role);
	if (!right.ok) return problem(403, 'forbidden', right.why);
	const body = await readJson(request, newCommentSchema);
	if (!body.ok) return body.response;
	const { body: text, ...subject } = body.data;
	if (!(await subjectInTeam(locals.db, teamId, subject)))
		return problem(404, 'not_found', `No such ${subject.on} in this team`);
	const written = await commentsWrittenSince(
		locals.db,
		userId,
		new Date(Date.now() - COMMENT_RATE.windowMs),
	);
	if (written >= COMMENT_RATE.max)
		return problem(
			429,
			'rate_limited',
			'That is a lot of comments at once. Wait a few minutes and try again; your text is kept.',
			undefined,
			{ 'retry-after': String(Math.round(COMMENT_RATE.windowMs / 1000)) },
		);
	const mentions = await mentionsIn(locals.db, teamId, text, userId);
	const saved = await insertComment(
		locals.db,
		{
			teamId,
			subject,
			authorId: userId,
			authorName: locals.user?.name ?? locals.user?.email ?? '',
			body: text,
		},
		mentions.notify.map((m) => m.id),
	).catch((error: unknown) => {
		// The subject was deleted between the check and the write.
		if ((error as { code?: string }).code === '23503') return null;
		throw error;
	});
	if (!saved) return problem(404, 'not_found', `No such ${subject.on} in this team`);
	const { row, notifications } = saved;
	if (notifications.length > 0)
		void sendMentionMail(locals.db, locals.mailer, locals.config, notifications).catch((error) =>
			log.warn({ err: error }, 'mention mail not sent; the job retries it'),
		);
	const result: CommentWriteResult = {
		comment: toCommentDto(
			{ ...row, name: locals.user?.name ?? null, email: locals.user?.email ?? null },
			auth.value,
		),
		mentioned: mentions.names,
		unknown: mentions.unknown,
	};
	return Response.json(result, { status: 201 });
};
