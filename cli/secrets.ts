import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';

export interface LocalSecrets {
	AUTH_SECRET: string;
}

/** Reads .data/secrets.json, creating it with fresh random values on first run (mode 0600). */
export function loadOrCreateSecrets(dir = '.data'): LocalSecrets {
	const file = path.join(dir, 'secrets.json');
	if (existsSync(file)) return JSON.parse(readFileSync(file, 'utf8')) as LocalSecrets;
	mkdirSync(dir, { recursive: true });
	const secrets: LocalSecrets = { AUTH_SECRET: randomBytes(32).toString('base64url') };
	writeFileSync(file, JSON.stringify(secrets, null, 2), { mode: 0o600 });
	return secrets;
}
