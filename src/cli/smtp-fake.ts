/**
 * A local SMTP server on loopback that accepts every message and stores it as JSON in a folder,
 * for the development outbox (/dev/outbox) and the tests. Never used when SMTP_URL is set.
 */
import { randomBytes } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

import type { OutboxMail as StoredMail } from '../lib/server/dev-outbox';

export interface SmtpFake {
	port: number;
	dir: string;
	close: () => Promise<void>;
}

export async function startSmtpFake(opts: {
	port: number;
	dir: string;
	host?: string;
}): Promise<SmtpFake> {
	mkdirSync(opts.dir, { recursive: true });
	const server = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS'],
		logger: false,
		onData(stream, session, callback) {
			simpleParser(stream)
				.then((mail) => {
					const receivedAt = new Date();
					const id = `${receivedAt.getTime()}-${randomBytes(4).toString('hex')}`;
					const stored: StoredMail = {
						id,
						from:
							mail.from?.text ??
							String(session.envelope.mailFrom && session.envelope.mailFrom.address),
						to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
						subject: mail.subject ?? '',
						text: mail.text ?? '',
						html: typeof mail.html === 'string' ? mail.html : '',
						receivedAt: receivedAt.toISOString(),
					};
					writeFileSync(path.join(opts.dir, `${id}.json`), JSON.stringify(stored, null, 2));
					callback();
				})
				.catch((error: Error) => callback(error));
		},
	});
	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(opts.port, opts.host ?? '127.0.0.1', () => resolve());
	});
	const address = server.server.address();
	const port = typeof address === 'object' && address ? address.port : opts.port;
	return {
		port,
		dir: opts.dir,
		close: () => new Promise((resolve) => server.close(() => resolve())),
	};
}
