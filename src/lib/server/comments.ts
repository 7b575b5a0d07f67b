import type { Kysely } from 'kysely';
import {
	COMMENT_EDIT_WINDOW_MS,
	type CommentDto,
	type ThreadSubject,
	type ThreadDto,
} from '@/lib/schemas/comments';
import type { Role } from '@/lib/schemas/teams';
import { findMentions } from '@/lib/mentions';
import {
	authorLabel,
	findThread,
	mentionableMembers,
	viewersMayComment,
} from '@/lib/server/db/comments';
import type { Database } from '@/lib/server/db/schema';

type Db = Kysely<Database>;

export interface Caller {
	userId: string;
	role: Role;
}

interface CommentRow {
	id: string;
	author_id: string | null;
	author_name: string;
	imported_by: string | null;
	body: string;
	created_at: Date;
	edited_at: Date | null;
	name?: string | null;
	email?: string | null;
}

/** How many comments one person may write in a window: a thread, not a flood of mentions and mail. */
export const COMMENT_RATE = { windowMs: 10 * 60_000, max: 60 };

/** Whether the author may still change or delete what they wrote. */
export const withinEditWindow = (createdAt: Date, now = Date.now()) =>
	now - createdAt.getTime() <= COMMENT_EDIT_WINDOW_MS;

export function toCommentDto(r: CommentRow, caller: Caller, now = Date.now()): CommentDto {
	const mine = r.author_id === caller.userId && withinEditWindow(r.created_at, now);
	return {
		id: r.id,
		authorId: r.author_id,
		authorName: authorLabel({ name: r.name ?? null, email: r.email ?? null, ...r }),
		body: r.body,
		createdAt: r.created_at.toISOString(),
		editedAt: r.edited_at?.toISOString() ?? null,
		canEdit: mine,
		canDelete: mine || caller.role === 'captain',
	};
}

/** Whether the caller may write in the team's threads, and why not when not. */
export async function commentRight(
	db: Db,
	teamId: string,
	role: Role,
): Promise<{ ok: true } | { ok: false; why: string }> {
	if (role !== 'viewer' || (await viewersMayComment(db, teamId))) return { ok: true };
	return {
		ok: false,
		why: 'Viewers of this team read the threads; a captain can let them comment',
	};
}

export async function threadOf(
	db: Db,
	teamId: string,
	subject: ThreadSubject,
	caller: Caller,
): Promise<ThreadDto> {
	const [rows, members, right] = await Promise.all([
		findThread(db, teamId, subject),
		mentionableMembers(db, teamId),
		commentRight(db, teamId, caller.role),
	]);
	const now = Date.now();
	return {
		comments: rows.map((r) => toCommentDto(r, caller, now)),
		canComment: right.ok,
		whyNot: right.ok ? null : right.why,
		members,
	};
}

/** The members a text mentions, but never its author, and the names after an @ that are nobody's here. */
export async function mentionsIn(db: Db, teamId: string, body: string, authorId: string) {
	const found = findMentions(body, await mentionableMembers(db, teamId));
	return {
		notify: found.mentioned.filter((m) => m.id !== authorId),
		names: found.mentioned.map((m) => m.name),
		unknown: found.unknown,
	};
}
