import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useEffect, useId, useState } from 'react';
import { Button, FormMessage } from '@/components/ui/Field';
import { ApiError } from '@/lib/client/api-client';
import { commentDrafts } from '@/lib/client/draft-store';
import { useLocalFormat } from '@/lib/client/local-time';
import { getQueryClient } from '@/lib/client/query-client';
import {
	threadQueryOptions,
	useAddComment,
	useDeleteComment,
	useEditComment,
	type CommentWriteResult,
	type ThreadSubject,
} from '@/lib/client/queries/comments';
import type { CommentDto } from '@/lib/schemas/comments';
import { CommentBody } from './CommentBody';
import { CommentBox } from './CommentBox';

export interface CommentThreadProps {
	teamId: string;
	subject: ThreadSubject;
	/** The thread's heading ("Discussion of r12"). */
	title?: string;
	/** Shut behind "Comments (n)" until opened (lists of revisions); open otherwise. */
	collapsed?: boolean;
	/** Opened at once (the revision a notification points at). */
	startOpen?: boolean;
	count?: number;
}

/** The thread as an island of its own (pages); inside another island use CommentThreadView. */
export function CommentThread(props: CommentThreadProps) {
	return (
		<QueryClientProvider client={getQueryClient()}>
			<CommentThreadView {...props} />
		</QueryClientProvider>
	);
}

export function CommentThreadView({
	teamId,
	subject,
	title = 'Discussion',
	collapsed = false,
	startOpen = false,
	count,
}: CommentThreadProps) {
	const [open, setOpen] = useState(!collapsed || startOpen);
	const headingId = useId();
	// Once opened, the summary counts what the thread holds now (a comment just posted included).
	const loaded = useQuery({ ...threadQueryOptions(teamId, subject), enabled: collapsed && open });
	const shown = loaded.data?.comments.length ?? count;
	if (collapsed)
		return (
			<details
				className="mt-3 rounded-md border border-hairline"
				open={open}
				onToggle={(e) => setOpen(e.currentTarget.open)}
				data-thread={`${subject.on}:${subject.id}`}
			>
				<summary className="cursor-pointer px-3 py-2 text-sm font-semibold text-copper-dark">
					{shown ? `Comments (${shown})` : 'Comment'}
				</summary>
				{open && (
					<div className="border-t border-hairline p-3">
						<ThreadBody teamId={teamId} subject={subject} />
					</div>
				)}
			</details>
		);
	return (
		<section
			aria-labelledby={headingId}
			className="mt-8 rounded-md border border-hairline bg-card p-4"
			data-thread={`${subject.on}:${subject.id}`}
		>
			<h2 id={headingId} className="text-lg font-bold">
				{title}
			</h2>
			<ThreadBody teamId={teamId} subject={subject} />
		</section>
	);
}

function ThreadBody({ teamId, subject }: { teamId: string; subject: ThreadSubject }) {
	const thread = useQuery(threadQueryOptions(teamId, subject));
	if (thread.isPending)
		return (
			<p role="status" className="text-sm text-ink-soft">
				Loading the comments…
			</p>
		);
	if (thread.isError)
		return (
			<FormMessage tone="error">
				Could not load the comments
				{thread.error instanceof ApiError ? `: ${thread.error.message}` : ''}.
			</FormMessage>
		);
	const { comments, canComment, whyNot, members } = thread.data;
	return (
		<div className="flex flex-col gap-3">
			{comments.length === 0 ? (
				<p className="text-sm text-ink-soft">No comment yet.</p>
			) : (
				<ol className="flex flex-col gap-3">
					{comments.map((c) => (
						<CommentItem
							key={c.id}
							teamId={teamId}
							subject={subject}
							comment={c}
							members={members}
						/>
					))}
				</ol>
			)}
			{canComment ? (
				<NewComment teamId={teamId} subject={subject} members={members} />
			) : (
				<p className="text-sm text-ink-soft">{whyNot}</p>
			)}
		</div>
	);
}

function CommentItem({
	teamId,
	subject,
	comment: c,
	members,
}: {
	teamId: string;
	subject: ThreadSubject;
	comment: CommentDto;
	members: Array<{ id: string; name: string }>;
}) {
	const fmt = useLocalFormat();
	const [editing, setEditing] = useState(false);
	const edit = useEditComment(teamId, subject);
	const remove = useDeleteComment(teamId, subject);
	const [text, setText] = useState(c.body);
	const [result, setResult] = useState<CommentWriteResult | null>(null);
	return (
		<li className="rounded-md bg-paper px-3 py-2" data-comment={c.id}>
			<p className="flex flex-wrap items-baseline gap-x-2 text-sm">
				<span className="font-semibold">{c.authorName}</span>
				<time dateTime={c.createdAt} className="text-ink-soft">
					{fmt(c.createdAt, 'd MMM yyyy HH:mm')}
				</time>
				{c.editedAt && <span className="text-xs text-ink-soft">(edited)</span>}
			</p>
			{editing ? (
				<form
					className="mt-2 flex flex-col gap-2"
					onSubmit={(e) => {
						e.preventDefault();
						edit.mutate(
							{ id: c.id, body: text },
							{
								onSuccess: (r) => {
									setResult(r);
									setEditing(false);
								},
							},
						);
					}}
				>
					<CommentBox
						label="Change the comment"
						value={text}
						onChange={setText}
						error={edit.error}
						members={members}
					/>
					<div className="flex gap-2">
						<Button type="submit" variant="secondary" busy={edit.isPending}>
							Save the change
						</Button>
						<Button type="button" variant="secondary" onClick={() => setEditing(false)}>
							Keep as it was
						</Button>
					</div>
				</form>
			) : (
				<CommentBody body={c.body} members={members} />
			)}
			{result && <MentionNote result={result} />}
			{remove.error && (
				<FormMessage tone="error">
					{remove.error instanceof ApiError ? remove.error.message : 'Could not delete it'}
				</FormMessage>
			)}
			{!editing && (c.canEdit || c.canDelete) && (
				<div className="mt-1 flex gap-3 text-sm">
					{c.canEdit && (
						<button
							type="button"
							className="text-copper-dark underline"
							onClick={() => {
								setText(c.body);
								setEditing(true);
							}}
						>
							Change
						</button>
					)}
					{c.canDelete && (
						<button
							type="button"
							className="text-brick underline"
							disabled={remove.isPending}
							onClick={() => {
								if (window.confirm('Delete this comment?')) remove.mutate(c.id);
							}}
						>
							Delete
						</button>
					)}
				</div>
			)}
		</li>
	);
}

function NewComment({
	teamId,
	subject,
	members,
}: {
	teamId: string;
	subject: ThreadSubject;
	members: Array<{ id: string; name: string }>;
}) {
	const draftKey = `${subject.on}:${subject.id}`;
	const [text, setText] = useState('');
	const [result, setResult] = useState<CommentWriteResult | null>(null);
	const add = useAddComment(teamId, subject);
	// The draft comes back after a reload (this member's only: see draft-store).
	useEffect(() => {
		const kept = commentDrafts.load(draftKey);
		if (kept?.body) setText(kept.body);
	}, [draftKey]);
	const change = (v: string) => {
		setText(v);
		if (v.trim()) commentDrafts.store(draftKey, { body: v });
		else commentDrafts.clear(draftKey);
	};
	const send = () => {
		setResult(null);
		add.mutate(text, {
			onSuccess: (r) => {
				setResult(r);
				setText('');
				commentDrafts.clear(draftKey);
			},
		});
	};
	return (
		<form
			noValidate
			className="flex flex-col gap-2"
			onSubmit={(e) => {
				e.preventDefault();
				send();
			}}
		>
			<CommentBox
				label="Add a comment"
				value={text}
				onChange={change}
				error={add.error}
				onSubmitKey={send}
				members={members}
			/>
			<div className="flex flex-wrap items-center gap-3">
				<Button type="submit" busy={add.isPending}>
					Post the comment
				</Button>
				<span className="text-xs text-ink-soft">Ctrl+Enter posts it</span>
			</div>
			{result && <MentionNote result={result} />}
		</form>
	);
}

function MentionNote({ result }: { result: CommentWriteResult }) {
	if (result.mentioned.length === 0 && result.unknown.length === 0) return null;
	return (
		<div className="flex flex-col gap-1 text-sm">
			{result.mentioned.length > 0 && (
				<FormMessage tone="ok">Notified: {result.mentioned.join(', ')}.</FormMessage>
			)}
			{result.unknown.length > 0 && (
				<FormMessage tone="info">
					No member of the team is called {result.unknown.map((u) => `@${u}`).join(', ')}: nobody
					was notified for {result.unknown.length === 1 ? 'that name' : 'those names'}.
				</FormMessage>
			)}
		</div>
	);
}
