import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { type SmtpFake, startSmtpFake } from '../../src/cli/smtp-fake';
import { listOutbox, type OutboxMail } from '../../src/lib/server/dev-outbox';
import { createSmtpMailer, type Mailer } from '../../src/lib/server/mail';

export interface TestMail {
	fake: SmtpFake;
	mailer: Mailer;
	/** Waits for the newest mail to an address (optionally newer than a count already seen). */
	waitFor: (to: string, opts?: { after?: number; timeoutMs?: number }) => Promise<OutboxMail>;
	count: (to: string) => number;
	close: () => Promise<void>;
}

export async function startTestMail(): Promise<TestMail> {
	const dir = mkdtempSync(path.join(tmpdir(), 'sagwise-mail-'));
	const fake = await startSmtpFake({ port: 0, dir });
	const mailer = createSmtpMailer(
		`smtp://127.0.0.1:${fake.port}`,
		'Sagwise tests <tests@sagwise.test>',
	);
	const to = (address: string) =>
		listOutbox(dir).filter((m) => m.to.includes(address.toLowerCase()));
	return {
		fake,
		mailer,
		count: (address) => to(address).length,
		waitFor: async (address, opts = {}) => waitForMail(dir, address, opts),
		close: () => fake.close(),
	};
}

export async function waitForMail(
	dir: string,
	address: string,
	opts: { after?: number; timeoutMs?: number } = {},
): Promise<OutboxMail> {
	const deadline = Date.now() + (opts.timeoutMs ?? 5000);
	for (;;) {
		const mails = listOutbox(dir).filter((m) => m.to.includes(address.toLowerCase()));
		if (mails.length > (opts.after ?? 0)) return mails[0]!;
		if (Date.now() > deadline)
			throw new Error(`no mail to ${address} within ${opts.timeoutMs ?? 5000} ms`);
		await new Promise((r) => setTimeout(r, 50));
	}
}

/** The first link in a mail's plain-text body that contains `fragment`. */
export function linkIn(mail: OutboxMail, fragment: string): string {
	const link = [...mail.text.matchAll(/https?:\/\/\S+/g)]
		.map((m) => m[0])
		.find((l) => l.includes(fragment));
	if (!link) throw new Error(`no link with ${fragment} in "${mail.subject}"`);
	return link;
}
