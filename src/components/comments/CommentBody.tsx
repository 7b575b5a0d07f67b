import { useMemo } from 'react';
import { mentionSegments } from '@/lib/mentions';

/**
 * A comment as written: plain text with its line breaks, links left as text, every character
 * escaped by React; mentions of members stand out.
 */
export function CommentBody({
	body,
	members,
}: {
	body: string;
	members: Array<{ id: string; name: string }>;
}) {
	const parts = useMemo(() => mentionSegments(body, members), [body, members]);
	return (
		<p className="mt-1 text-sm break-words whitespace-pre-wrap">
			{parts.map((p, i) =>
				'member' in p ? (
					<strong
						key={i}
						className="rounded bg-copper-tint px-0.5 text-copper-dark"
						data-mention={p.member.id}
					>
						{p.text}
					</strong>
				) : (
					<span key={i}>{p.text}</span>
				),
			)}
		</p>
	);
}
