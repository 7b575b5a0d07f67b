import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';

/** A single-use secret for a link: the raw token goes in the e-mail, only its hash is stored. */
export function newToken(): { token: string; hash: string } {
	const token = randomBytes(32).toString('base64url');
	return { token, hash: hashToken(token) };
}

export const hashToken = (token: string): string =>
	createHash('sha256').update(token).digest('hex');

const unsubscribeMac = (userId: string, key: string) =>
	createHmac('sha256', key).update(`unsubscribe-mentions:${userId}`).digest('base64url');

/**
 * The one-click unsubscribe token of a person's mention mail: their id and its HMAC under the
 * server's key, so the link works without signing in and cannot be made for anyone else.
 */
export function unsubscribeToken(userId: string, key: string): string {
	return `${Buffer.from(userId).toString('base64url')}.${unsubscribeMac(userId, key)}`;
}

/** The person an unsubscribe token was made for, or null when it is not one of ours. */
export function readUnsubscribeToken(token: string, key: string): string | null {
	const [id, mac, ...rest] = token.split('.');
	if (!id || !mac || rest.length > 0 || token.length > 400) return null;
	const userId = Buffer.from(id, 'base64url').toString('utf8');
	const want = Buffer.from(unsubscribeMac(userId, key));
	const got = Buffer.from(mac);
	return got.length === want.length && timingSafeEqual(got, want) ? userId : null;
}
