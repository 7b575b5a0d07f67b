import { useId, useRef, useState } from 'react';
import { ApiError } from '@/lib/client/api-client';
import { mentionQueryAt, suggestMembers } from '@/lib/mentions';
import { COMMENT_MAX_CHARS } from '@/lib/schemas/comments';

/**
 * A comment's text box: its label, the hint, the server's word on it, and while an `@name` is
 * being typed, the members it may be as buttons (Tab reaches them; choosing one writes the name in
 * full, spaces and all, and puts the caret after it).
 */
export function CommentBox({
	label,
	value,
	onChange,
	error,
	onSubmitKey,
	members,
}: {
	label: string;
	value: string;
	onChange: (v: string) => void;
	error: Error | null;
	onSubmitKey?: () => void;
	members: Array<{ id: string; name: string }>;
}) {
	const id = useId();
	const box = useRef<HTMLTextAreaElement>(null);
	const [caret, setCaret] = useState<number | null>(null);
	const typing = caret === null ? null : mentionQueryAt(value, caret);
	const suggestions = typing ? suggestMembers(typing.query, members) : [];
	const example = members.find((m) => m.name.includes(' '))?.name ?? members[0]?.name;
	const message =
		error instanceof ApiError
			? (error.byField().body ?? error.message)
			: error
				? 'Could not send it; your text is kept here'
				: null;
	const choose = (name: string) => {
		if (!typing || caret === null) return;
		const next = `${value.slice(0, typing.start)}@${name} ${value.slice(caret)}`;
		const at = typing.start + name.length + 2;
		onChange(next);
		setCaret(null);
		requestAnimationFrame(() => {
			box.current?.focus();
			box.current?.setSelectionRange(at, at);
			setCaret(at);
		});
	};
	return (
		<div className="flex flex-col gap-1">
			<label htmlFor={id} className="text-sm font-semibold">
				{label}
			</label>
			<textarea
				ref={box}
				id={id}
				rows={3}
				maxLength={COMMENT_MAX_CHARS}
				value={value}
				onChange={(e) => {
					onChange(e.target.value);
					setCaret(e.target.selectionStart);
				}}
				onSelect={(e) => setCaret(e.currentTarget.selectionStart)}
				onKeyDown={(e) => {
					if (onSubmitKey && e.key === 'Enter' && (e.ctrlKey || e.metaKey)) {
						e.preventDefault();
						onSubmitKey();
					}
				}}
				aria-invalid={message ? true : undefined}
				aria-describedby={`${id}-hint${message ? ` ${id}-error` : ''}`}
				className={`rounded-md border bg-card px-3 py-2 text-base shadow-sm outline-none focus:border-copper focus:ring-2 focus:ring-copper/30 ${message ? 'border-brick' : 'border-hairline'}`}
			/>
			{suggestions.length > 0 && (
				<div role="group" aria-label="Mention a member" className="flex flex-wrap gap-2">
					{suggestions.map((m) => (
						<button
							key={m.id}
							type="button"
							className="rounded-full border border-hairline bg-paper px-2.5 py-0.5 text-sm hover:border-copper"
							onMouseDown={(e) => e.preventDefault()}
							onClick={() => choose(m.name)}
						>
							@{m.name}
						</button>
					))}
				</div>
			)}
			<p id={`${id}-hint`} className="text-xs text-ink-soft">
				Plain text; links show as text. Mention a team member with @ and their name
				{example ? ` (e.g. @${example})` : ''} to notify them.
			</p>
			{message && (
				<p id={`${id}-error`} role="alert" className="text-sm text-brick">
					<span aria-hidden="true">✕</span> {message}
				</p>
			)}
		</div>
	);
}
