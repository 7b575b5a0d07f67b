import type { Kysely } from 'kysely';
import type { Database } from '../../../db/schema';
import { countRecentFailures, recordSignInAttempt } from './db/users';

export const SIGN_IN_WINDOW_MS = 60_000;
/** Failed password attempts allowed per address, and per client, within the window. */
export const MAX_FAILURES_PER_EMAIL = 10;
export const MAX_FAILURES_PER_CLIENT = 30;

/** True when another attempt for this address or from this client must be refused. */
export async function signInLimited(db: Kysely<Database>, email: string, client: string): Promise<boolean> {
	const [byEmail, byClient] = await Promise.all([
		countRecentFailures(db, { email }, SIGN_IN_WINDOW_MS),
		countRecentFailures(db, { client }, SIGN_IN_WINDOW_MS),
	]);
	return byEmail >= MAX_FAILURES_PER_EMAIL || byClient >= MAX_FAILURES_PER_CLIENT;
}

export { recordSignInAttempt };
