import { format } from 'date-fns';
import type { Kysely } from 'kysely';
import { authorLabel } from '@/lib/server/db/comments';
import {
	claimMailed,
	claimNotification,
	digestRecipients,
	findUnmailed,
	releaseMailed,
	releaseNotification,
} from '@/lib/server/db/notifications';
import type { Database } from '@/lib/server/db/schema';
import type { ServerConfig } from './config';
import { log } from './log';
import type { Mailer } from './mail';
import { unsubscribeToken } from './tokens';

type Db = Kysely<Database>;
type Unmailed = Awaited<ReturnType<typeof findUnmailed>>[number];

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** A comment's first lines for a mail (links stay text; the HTML part escapes it). */
const excerpt = (body: string) => (body.length > 600 ? `${body.slice(0, 600)}…` : body);

function unsubscribe(config: ServerConfig, userId: string) {
	const url = `${config.publicUrl}/unsubscribe?token=${unsubscribeToken(userId, config.linkSigningKey)}`;
	return {
		url,
		// Opening the link is the one click: it stops the mail at once, no sign-in needed.
		headers: { 'List-Unsubscribe': `<${url}>` },
	};
}

function mentionText(n: Unmailed, config: ServerConfig) {
	const who = authorLabel(n);
	return {
		line: `${who} mentioned you on ${n.place.label} (${n.team_name})`,
		body: excerpt(n.body),
		url: `${config.publicUrl}${n.place.href}`,
	};
}

const footer = (url: string) => ({
	text: `\n\nYou get this because a team member mentioned you. Stop these mails: ${url}\n\n— Sagwise`,
	html: `<p style="color:#555;font-size:12px">You get this because a team member mentioned you. <a href="${esc(url)}">Stop these mails</a>.</p>`,
});

/**
 * Mails each mention at once to the people who chose that, still in the team. A notification is
 * marked mailed before its mail goes (so two senders never both mail it) and given back if the
 * send fails, for the next try (`npm run jobs mentions`). No transaction is held open while the
 * mail server answers: a slow or stopped SMTP service ties up no database connection. `ids`
 * narrows it to the notifications a comment just made.
 */
export async function sendMentionMail(
	db: Db,
	mailer: Mailer,
	config: ServerConfig,
	ids?: string[],
): Promise<number> {
	let sent = 0;
	for (const n of await findUnmailed(db, 'immediate', { ids })) {
		if ((await claimMailed(db, [n.id])).length === 0) continue;
		const m = mentionText(n, config);
		const stop = unsubscribe(config, n.user_id);
		const end = footer(stop.url);
		try {
			await mailer.send({
				to: n.to_email,
				subject: `${authorLabel(n)} mentioned you on ${n.place.label}`,
				text: `${m.line}:\n\n${m.body}\n\nThe thread: ${m.url}${end.text}`,
				html: `<p>${esc(m.line)}:</p><blockquote style="white-space:pre-wrap">${esc(m.body)}</blockquote><p><a href="${esc(m.url)}">The thread</a></p>${end.html}`,
				headers: stop.headers,
			});
			sent++;
		} catch (error) {
			await releaseMailed(db, [n.id]).catch(() => undefined);
			log.warn({ err: error, notification: n.id }, 'mention mail not sent; the job retries it');
		}
	}
	return sent;
}

/**
 * One mail a day to each person who chose the digest, listing their mentions not yet mailed. The
 * day goes into the ledger and the mentions are marked mailed in one transaction, committed before
 * the mail is sent: a second run that day (or a second machine at once) finds them taken and sends
 * nothing. A failed send gives both back for the next run.
 */
export async function sendMentionDigests(
	db: Db,
	mailer: Mailer,
	config: ServerConfig,
	now = new Date(),
): Promise<number> {
	const day = format(now, 'yyyy-MM-dd');
	let sent = 0;
	for (const userId of await digestRecipients(db)) {
		const mine = await db.transaction().execute(async (trx) => {
			const items = await findUnmailed(trx, 'daily', { userId });
			if (items.length === 0) return [];
			if (!(await claimNotification(trx, 'mention_digest', day, userId))) return [];
			const taken = new Set(
				await claimMailed(
					trx,
					items.map((i) => i.id),
				),
			);
			return items.filter((i) => taken.has(i.id));
		});
		if (mine.length === 0) continue;
		const stop = unsubscribe(config, userId);
		const end = footer(stop.url);
		const parts = mine.map((n) => mentionText(n, config));
		try {
			await mailer.send({
				to: mine[0]!.to_email,
				subject: `${mine.length} mention${mine.length === 1 ? '' : 's'} of you today`,
				text: `${parts.map((p) => `${p.line}:\n${p.body}\n${p.url}`).join('\n\n')}${end.text}`,
				html: `${parts.map((p) => `<p>${esc(p.line)}:</p><blockquote style="white-space:pre-wrap">${esc(p.body)}</blockquote><p><a href="${esc(p.url)}">The thread</a></p>`).join('<hr>')}${end.html}`,
				headers: stop.headers,
			});
			sent++;
		} catch (error) {
			await db
				.transaction()
				.execute(async (trx) => {
					await releaseMailed(
						trx,
						mine.map((i) => i.id),
					);
					await releaseNotification(trx, 'mention_digest', day, userId);
				})
				.catch(() => undefined);
			log.warn({ err: error, user: userId }, 'mention digest not sent; the next run retries it');
		}
	}
	return sent;
}
