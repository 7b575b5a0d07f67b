import type { AppUser } from './auth';

/** Auth.js's session cookie, under either name, and the chunks it splits a large one into. */
export const SESSION_COOKIE = /^(__Secure-)?authjs\.session-token(\.\d+)?$/;

/** How long a checked session is taken at its word (ms); every account change below ends it at once. */
const KEEP_MS = 10_000;
const MAX_ENTRIES = 5_000;

/**
 * Who a session cookie belongs to, remembered for a few seconds. Reading a session means running
 * Auth.js's whole session handler: decrypting the token, reading the account's session version
 * and encrypting a renewed token the page never sends. A member's page views come seconds apart;
 * one check serves them. Keyed by the session cookie's own value, so another person's cookie in the
 * same browser is another key; an ended session (password reset, first e-mail sign-in) is
 * forgotten here in the same process that ends it.
 */
const known = new Map<string, { user: AppUser; at: number }>();
/** When each account's sessions last ended: a read begun before that is not kept. */
const endedAt = new Map<string, number>();

/** The session cookie's value(s) in a Cookie header, or null when it carries none. */
export function sessionCookieOf(cookieHeader: string | null): string | null {
	if (!cookieHeader) return null;
	const parts = cookieHeader
		.split(';')
		.map((c) => c.trim())
		.filter((c) => SESSION_COOKIE.test(c.slice(0, Math.max(0, c.indexOf('=')))))
		.sort();
	return parts.length > 0 ? parts.join('; ') : null;
}

export async function cachedSessionUser(
	cookieHeader: string | null,
	read: () => Promise<AppUser | null>,
	now = Date.now(),
): Promise<AppUser | null> {
	const key = sessionCookieOf(cookieHeader);
	if (key === null) return null; // no session cookie: nobody is signed in
	const hit = known.get(key);
	if (hit && now - hit.at < KEEP_MS) return hit.user;
	if (hit) known.delete(key);
	const started = now;
	const user = await read();
	if (user && (endedAt.get(user.id) ?? -Infinity) < started) {
		known.set(key, { user, at: now });
		if (known.size > MAX_ENTRIES) known.delete(known.keys().next().value!);
	}
	return user;
}

/** Every remembered session of an account ends now (its session version was just raised). */
export function forgetSessionsOf(userId: string, now = Date.now()): void {
	endedAt.set(userId, now);
	if (endedAt.size > MAX_ENTRIES) endedAt.delete(endedAt.keys().next().value!);
	for (const [key, entry] of known) if (entry.user.id === userId) known.delete(key);
}
