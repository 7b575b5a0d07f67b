import { z } from '@/lib/zod';
import { notesText } from './text';

/** What a thread can be beside. */
export const COMMENT_SUBJECTS = ['revision', 'run', 'plan', 'event'] as const;
export type CommentSubjectKind = (typeof COMMENT_SUBJECTS)[number];

/** How long after writing a comment its author may still change or delete it. */
export const COMMENT_EDIT_WINDOW_MS = 15 * 60 * 1000;
export const COMMENT_MAX_CHARS = 4000;

const body = notesText(COMMENT_MAX_CHARS, {
	required: 'Write something first',
	maxMessage: 'Keep a comment under 4,000 characters',
});

export const threadSubjectSchema = z.object({
	on: z.enum(COMMENT_SUBJECTS, { error: 'on is revision, run, plan or event' }),
	id: z.uuid({ error: 'id is the id of what the thread is beside' }),
});
export type ThreadSubject = z.infer<typeof threadSubjectSchema>;

export const newCommentSchema = threadSubjectSchema.extend({ body });
export const editCommentSchema = z.object({ body });

export const mailChoiceSchema = z.enum(['immediate', 'daily', 'off'], {
	error: 'Mail is immediate, daily or off',
});
export type MailChoice = z.infer<typeof mailChoiceSchema>;

export const markReadSchema = z
	.object({
		all: z.literal(true, { error: 'all is true (or send ids)' }).optional(),
		ids: z
			.array(z.uuid({ error: 'Each id is a notification’s id' }))
			.min(1, 'Name at least one notification')
			.max(500, 'At most 500 at once')
			.optional(),
	})
	.refine((v) => v.all !== undefined || v.ids !== undefined, {
		path: ['all'],
		message: 'Send all: true, or the ids to mark read',
	});

export interface CommentDto {
	id: string;
	authorId: string | null;
	/** The author's name as shown (a former member's as the team knew them). */
	authorName: string;
	body: string;
	createdAt: string;
	editedAt: string | null;
	/** The caller may change it (its author, within the window). */
	canEdit: boolean;
	/** The caller may delete it (its author within the window, or a captain). */
	canDelete: boolean;
}

export interface ThreadDto {
	comments: CommentDto[];
	/** Whether the caller may write here; when not, `whyNot` says why. */
	canComment: boolean;
	whyNot: string | null;
	/** The team's members, for reading and writing mentions. */
	members: Array<{ id: string; name: string }>;
}

/** What a new or changed comment did: who it notified, and names it could not find. */
export interface CommentWriteResult {
	comment: CommentDto;
	mentioned: string[];
	unknown: string[];
}

export interface NotificationDto {
	id: string;
	teamId: string;
	teamName: string;
	author: string;
	/** What the thread is beside, in words ("r12 of Marlin"). */
	subject: string;
	href: string;
	excerpt: string;
	createdAt: string;
	read: boolean;
}

export interface NotificationsDto {
	unread: number;
	items: NotificationDto[];
	mail: MailChoice;
}
