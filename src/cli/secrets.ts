import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';

export interface LocalSecrets {
	AUTH_SECRET: string;
	/** The bearer token that reads `/api/metrics`. */
	METRICS_TOKEN: string;
}

const fresh = () => randomBytes(32).toString('base64url');

/**
 * Reads .data/secrets.json, creating it with fresh random values on first run (mode 0600); a value
 * an older file lacks is added to it.
 */
export function loadOrCreateSecrets(dir = '.data'): LocalSecrets {
	const file = path.join(dir, 'secrets.json');
	const known = existsSync(file)
		? (JSON.parse(readFileSync(file, 'utf8')) as Partial<LocalSecrets>)
		: {};
	const secrets: LocalSecrets = {
		AUTH_SECRET: known.AUTH_SECRET ?? fresh(),
		METRICS_TOKEN: known.METRICS_TOKEN ?? fresh(),
	};
	if (known.AUTH_SECRET !== secrets.AUTH_SECRET || known.METRICS_TOKEN !== secrets.METRICS_TOKEN) {
		mkdirSync(dir, { recursive: true });
		writeFileSync(file, JSON.stringify(secrets, null, 2), { mode: 0o600 });
	}
	return secrets;
}
