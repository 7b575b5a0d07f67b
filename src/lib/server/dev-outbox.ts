import { existsSync, readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';

export interface OutboxMail {
	id: string;
	from: string;
	to: string[];
	subject: string;
	text: string;
	html: string;
	receivedAt: string;
}

/** Mail the local SMTP fake caught, newest first. */
export function listOutbox(dir: string): OutboxMail[] {
	if (!existsSync(dir)) return [];
	return readdirSync(dir)
		.filter((f) => f.endsWith('.json'))
		.sort()
		.reverse()
		.map((f) => JSON.parse(readFileSync(path.join(dir, f), 'utf8')) as OutboxMail);
}

export function findOutboxMail(dir: string, id: string): OutboxMail | null {
	if (!/^[\w-]+$/.test(id)) return null;
	const file = path.join(dir, `${id}.json`);
	return existsSync(file) ? (JSON.parse(readFileSync(file, 'utf8')) as OutboxMail) : null;
}
