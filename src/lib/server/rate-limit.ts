import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import {
	countRateEvents,
	countRecentFailures,
	recordRateEvent,
	recordSignInAttempt,
} from '@/lib/server/db/users';

export const SIGN_IN_WINDOW_MS = 60_000;
/** Failed password attempts allowed per address, and per client, within the window. */
export const MAX_FAILURES_PER_EMAIL = 10;
export const MAX_FAILURES_PER_CLIENT = 30;

/** True when another attempt for this address or from this client must be refused. */
export async function signInLimited(
	db: Kysely<Database>,
	email: string,
	client: string,
): Promise<boolean> {
	const [byEmail, byClient] = await Promise.all([
		countRecentFailures(db, { email }, SIGN_IN_WINDOW_MS),
		countRecentFailures(db, { client }, SIGN_IN_WINDOW_MS),
	]);
	return byEmail >= MAX_FAILURES_PER_EMAIL || byClient >= MAX_FAILURES_PER_CLIENT;
}

export { recordSignInAttempt };

export type RateKind = 'reset_mail' | 'link_mail' | 'sign_up';

/**
 * Mails and sign-ups anyone can trigger, limited per address and per client over a window, in
 * PostgreSQL so every app instance counts the same. Unknown addresses count like known ones, so
 * the limit tells nothing about who has an account.
 */
/** A whole number from the environment, or the default when it is unset or not one. */
function wholeFromEnv(name: string, fallback: number): number {
	const v = Number(process.env[name]);
	return Number.isInteger(v) && v > 0 ? v : fallback;
}

export const RATE_LIMITS: Record<
	RateKind,
	{ windowMs: number; perEmail: number; perClient: number }
> = {
	reset_mail: { windowMs: 15 * 60_000, perEmail: 3, perClient: 10 },
	link_mail: { windowMs: 15 * 60_000, perEmail: 5, perClient: 20 },
	// Many sign-ups from one address are a script, or a venue behind one router: the operator says which.
	sign_up: {
		windowMs: 60 * 60_000,
		perEmail: 3,
		perClient: wholeFromEnv('SAGWISE_SIGNUPS_PER_CLIENT_HOUR', 10),
	},
};

/**
 * Counts this action and says whether it may go ahead: one row per try (refused tries count too,
 * so hammering never opens the window early).
 */
export async function takeRateSlot(
	db: Kysely<Database>,
	kind: RateKind,
	email: string,
	client: string,
): Promise<boolean> {
	const limit = RATE_LIMITS[kind];
	const { byEmail, byClient } = await countRateEvents(db, kind, email, client, limit.windowMs);
	await recordRateEvent(db, kind, email, client);
	return byEmail < limit.perEmail && byClient < limit.perClient;
}
