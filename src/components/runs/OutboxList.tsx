import { format } from 'date-fns';
import { Button } from '@/components/ui/Field';
import { useEffect, useState } from 'react';
import {
	discard,
	onSessionChanged,
	type OutboxEntry,
	retry,
	sendOutbox,
} from '@/lib/client/outbox';
import { fmt } from '@/lib/format';

const STATE_WORDS: Record<OutboxEntry['state'], string> = {
	waiting: 'not yet sent',
	duplicate: 'held: looks like a run already logged',
	conflict: 'held: the checklist changed meanwhile',
	failed: 'refused',
};

function describe(e: OutboxEntry): string {
	if (e.kind === 'signoff')
		return `${e.body.signed ? 'Sign-off' : 'Withdrawn sign-off'}: ${e.label}`;
	const b = e.body;
	const parts = [
		b.scoreDb !== undefined && b.scoreDb !== null ? `${fmt(Number(b.scoreDb), 1)} dB` : null,
		b.minV !== undefined && b.minV !== null ? `min ${fmt(Number(b.minV))} V` : null,
		e.file ? `logger file ${e.file.name}${e.runId ? ' (run sent, file waiting)' : ''}` : null,
	].filter(Boolean);
	return `Run of ${format(new Date(b.ranAt), 'd MMM yyyy HH:mm:ss')}${parts.length ? ` · ${parts.join(' · ')}` : ''}`;
}

/**
 * What this device holds that the server does not have yet, clearly marked: it goes out by itself
 * when the connection returns; held entries wait for the member's decision.
 */
export function OutboxList({ entries, title }: { entries: OutboxEntry[]; title: string }) {
	if (entries.length === 0) return null;
	const waiting = entries.filter((e) => e.state === 'waiting').length;
	return (
		<section
			aria-label={title}
			className="rounded-md border-2 border-dashed border-amber bg-amber-tint/60 p-3 text-sm"
			data-outbox
		>
			<div className="flex flex-wrap items-center gap-2">
				<h2 className="font-semibold">
					{title}: {entries.length} on this device
				</h2>
				{waiting > 0 && (
					<Button
						type="button"
						variant="secondary"
						className="ml-auto px-2 py-1 text-xs"
						onClick={() => void sendOutbox()}
					>
						Try sending now
					</Button>
				)}
			</div>
			<p className="text-xs text-ink-soft">
				Kept in this browser until the server has them; they go out by themselves once the
				connection returns, each exactly once.
			</p>
			<ul className="mt-2 flex flex-col gap-2">
				{entries.map((e) => (
					<li
						key={e.id}
						className="flex flex-wrap items-center gap-2 rounded border border-hairline bg-card px-2 py-1.5"
						data-outbox-entry={e.state}
					>
						<span className="rounded bg-amber-text px-1.5 text-xs font-semibold text-white">
							{STATE_WORDS[e.state]}
						</span>
						<span className="min-w-0 flex-1 basis-48 break-words">{describe(e)}</span>
						{e.problem && <span className="w-full text-xs text-brick">{e.problem}</span>}
						{e.state === 'duplicate' && e.kind === 'run' && (
							<Button
								type="button"
								className="px-2 py-1 text-xs"
								onClick={() =>
									void retry(e.id, (x) =>
										x.kind === 'run' ? { ...x, body: { ...x.body, allowDuplicate: true } } : x,
									)
								}
							>
								Log it anyway
							</Button>
						)}
						<Button
							type="button"
							variant="secondary"
							className="px-2 py-1 text-xs"
							onClick={() => void discard(e.id)}
						>
							Discard
						</Button>
					</li>
				))}
			</ul>
		</section>
	);
}

/**
 * What other members left waiting on this device: whose, and how many, never what (a rival on a
 * shared phone learns nothing of another team's runs). They go out when their author signs in.
 */
export function OthersWaiting({ entries }: { entries: OutboxEntry[] }) {
	if (entries.length === 0) return null;
	const byAuthor = new Map<string, number>();
	for (const e of entries) {
		const who = e.userName || 'another member';
		byAuthor.set(who, (byAuthor.get(who) ?? 0) + 1);
	}
	return (
		<p
			className="rounded-md border border-hairline bg-paper p-2 text-xs text-ink-soft"
			data-others-waiting
		>
			Also on this device, waiting for their author to sign in here again:{' '}
			{[...byAuthor]
				.map(([who, n]) => `${n} ${n === 1 ? 'entry' : 'entries'} by ${who}`)
				.join(', ')}
			. They are not sent with your session.
		</p>
	);
}

/**
 * Said when the browser's session is no longer this page's member (signed out, or someone else
 * signed in in another tab): this page's waiting entries stay on the device, unsent.
 */
export function SessionChangedNotice() {
	const [changed, setChanged] = useState(false);
	useEffect(() => onSessionChanged(() => setChanged(true)), []);
	if (!changed) return null;
	return (
		<p
			role="alert"
			className="rounded-md border border-brick/40 bg-brick-tint p-2 text-sm"
			data-session-changed
		>
			Someone else is signed in in this browser now. Entries made on this page stay on the device
			and go out only when their author signs in again.{' '}
			<a href="/teams" className="font-semibold underline">
				Go to your teams
			</a>
		</p>
	);
}
