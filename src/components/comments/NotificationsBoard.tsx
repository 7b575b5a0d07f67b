import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useId } from 'react';
import { Button, FormMessage } from '@/components/ui/Field';
import { ApiError } from '@/lib/client/api-client';
import { useLocalFormat } from '@/lib/client/local-time';
import { getQueryClient } from '@/lib/client/query-client';
import {
	notificationsQueryOptions,
	useMarkRead,
	useSetMentionMail,
} from '@/lib/client/queries/comments';
import type { MailChoice } from '@/lib/schemas/comments';

const MAIL_CHOICES: Array<{ value: MailChoice; label: string }> = [
	{ value: 'immediate', label: 'Mail me each mention as it happens' },
	{ value: 'daily', label: 'Mail me once a day, one digest' },
	{ value: 'off', label: 'No mail: I read them here' },
];

export function NotificationsBoard() {
	return (
		<QueryClientProvider client={getQueryClient()}>
			<NotificationsView />
		</QueryClientProvider>
	);
}

function NotificationsView() {
	const list = useQuery(notificationsQueryOptions());
	const markRead = useMarkRead();
	const setMail = useSetMentionMail();
	const fmt = useLocalFormat();
	const mailId = useId();
	if (list.isPending)
		return (
			<p role="status" className="text-ink-soft">
				Loading your notifications…
			</p>
		);
	if (list.isError)
		return (
			<FormMessage tone="error">
				Could not load them{list.error instanceof ApiError ? `: ${list.error.message}` : ''}.
			</FormMessage>
		);
	const { items, unread, mail } = list.data;
	return (
		<div className="flex flex-col gap-6">
			<div className="flex flex-wrap items-center gap-3">
				<p role="status" className="font-semibold" data-unread-count={unread}>
					{unread === 0 ? 'Nothing unread.' : `${unread} unread`}
				</p>
				{unread > 0 && (
					<Button
						variant="secondary"
						busy={markRead.isPending}
						onClick={() => markRead.mutate({ all: true })}
					>
						Mark all read
					</Button>
				)}
			</div>
			{items.length === 0 ? (
				<p className="rounded-md border border-dashed border-hairline bg-card p-6 text-ink-soft">
					No mention yet. When a team member writes @ and your name in a comment, it shows here.
				</p>
			) : (
				<ol className="flex flex-col divide-y divide-hairline rounded-md border border-hairline bg-card">
					{items.map((n) => (
						<li
							key={n.id}
							className={`flex flex-col gap-1 px-4 py-3 ${n.read ? '' : 'border-l-4 border-copper'}`}
							data-notification={n.read ? 'read' : 'unread'}
						>
							<p className="text-sm">
								<strong>{n.author}</strong> mentioned you on{' '}
								<a
									href={n.href}
									className="text-copper-dark underline"
									onClick={(e) => {
										if (n.read || e.metaKey || e.ctrlKey || e.shiftKey) return;
										// Read before leaving: a request still in flight would die with the page.
										e.preventDefault();
										const go = () => window.location.assign(n.href);
										markRead.mutateAsync({ ids: [n.id] }).then(go, go);
									}}
								>
									{n.subject}
								</a>{' '}
								<span className="text-ink-soft">· {n.teamName}</span>
							</p>
							<p className="text-sm break-words whitespace-pre-wrap text-ink-soft">{n.excerpt}</p>
							<div className="flex flex-wrap items-center gap-3 text-xs text-ink-soft">
								<time dateTime={n.createdAt}>{fmt(n.createdAt, 'd MMM yyyy HH:mm')}</time>
								{!n.read && (
									<button
										type="button"
										className="text-copper-dark underline"
										onClick={() => markRead.mutate({ ids: [n.id] })}
									>
										Mark read
									</button>
								)}
							</div>
						</li>
					))}
				</ol>
			)}
			<fieldset className="rounded-md border border-hairline bg-card p-4">
				<legend className="px-1 font-semibold" id={mailId}>
					Mentions by e-mail
				</legend>
				<div className="flex flex-col gap-2">
					{MAIL_CHOICES.map((c) => (
						<label key={c.value} className="flex items-center gap-2 text-sm">
							<input
								type="radio"
								name="mention-mail"
								value={c.value}
								checked={mail === c.value}
								disabled={setMail.isPending}
								onChange={() => setMail.mutate(c.value)}
							/>
							{c.label}
						</label>
					))}
				</div>
				{setMail.isError && <FormMessage tone="error">Could not change it; try again.</FormMessage>}
				<p className="mt-2 text-xs text-ink-soft">
					Every mail has a link at its foot that stops them without signing in.
				</p>
			</fieldset>
		</div>
	);
}
