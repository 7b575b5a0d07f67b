import { randomUUID } from 'node:crypto';
import { type Kysely, sql } from 'kysely';
import type { Database, UserRow } from '@/lib/server/db/schema';

type Db = Kysely<Database>;

export function findUserByEmail(db: Db, email: string): Promise<UserRow | undefined> {
	return db.selectFrom('User').selectAll().where('email', '=', email.toLowerCase()).executeTakeFirst();
}

export function findUserById(db: Db, id: string): Promise<UserRow | undefined> {
	return db.selectFrom('User').selectAll().where('id', '=', id).executeTakeFirst();
}

/** Inserts a user; returns undefined when the address is already taken (unique violation). */
export async function insertUser(db: Db, user: { email: string; name: string; passwordHash: string | null }): Promise<UserRow | undefined> {
	return db
		.insertInto('User')
		.values({ id: randomUUID(), email: user.email.toLowerCase(), name: user.name, passwordHash: user.passwordHash })
		.onConflict((oc) => oc.column('email').doNothing())
		.returningAll()
		.executeTakeFirst();
}

export async function updatePassword(db: Db, userId: string, passwordHash: string): Promise<void> {
	await db.updateTable('User').set({ passwordHash }).where('id', '=', userId).execute();
}

// ---- password resets

export async function insertPasswordReset(db: Db, userId: string, tokenHash: string, ttlMs: number): Promise<void> {
	await db.insertInto('password_reset').values({ user_id: userId, token_hash: tokenHash, expires_at: new Date(Date.now() + ttlMs) }).execute();
}

export type ConsumeResult = { ok: true; userId: string } | { ok: false; reason: 'unknown' | 'used' | 'expired' };

/** Marks a reset token used, once, in the caller's transaction (row-locked so two requests cannot both use it). */
export async function consumePasswordReset(db: Db, tokenHash: string): Promise<ConsumeResult> {
	const row = await db.selectFrom('password_reset').selectAll().where('token_hash', '=', tokenHash).forUpdate().executeTakeFirst();
	if (!row) return { ok: false, reason: 'unknown' };
	if (row.used_at) return { ok: false, reason: 'used' };
	if (row.expires_at.getTime() < Date.now()) return { ok: false, reason: 'expired' };
	await db.updateTable('password_reset').set({ used_at: new Date() }).where('id', '=', row.id).execute();
	return { ok: true, userId: row.user_id };
}

// ---- sign-in attempts (rate limiting, shared by every app instance through PostgreSQL)

export async function recordSignInAttempt(db: Db, email: string, client: string, succeeded: boolean): Promise<void> {
	await db.insertInto('sign_in_attempt').values({ email: email.toLowerCase(), client, succeeded }).execute();
}

export async function countRecentFailures(db: Db, by: { email?: string; client?: string }, windowMs: number): Promise<number> {
	let q = db
		.selectFrom('sign_in_attempt')
		.select((eb) => eb.fn.countAll<number>().as('n'))
		.where('succeeded', '=', false)
		.where(sql<boolean>`created_at > now() - make_interval(secs => ${windowMs / 1000})`);
	if (by.email) q = q.where('email', '=', by.email.toLowerCase());
	if (by.client) q = q.where('client', '=', by.client);
	const { n } = await q.executeTakeFirstOrThrow();
	return Number(n);
}

// ---- sessions and confirmed addresses

/** The account's session version (null when the account is gone). */
export async function sessionVersionOf(db: Db, userId: string): Promise<number | null> {
	const row = await db.selectFrom('User').select('sessionVersion').where('id', '=', userId).executeTakeFirst();
	return row ? row.sessionVersion : null;
}

/** Ends every session of the account (they are checked against this version on each request). */
export async function endSessions(db: Db, userId: string): Promise<void> {
	await db.updateTable('User').set((eb) => ({ sessionVersion: eb('sessionVersion', '+', 1) })).where('id', '=', userId).execute();
}

/**
 * On the first proof that the owner reads this address (an e-mailed link): a password set before
 * the address was ever confirmed is dropped and its sessions end.
 */
export async function dropUnconfirmedPassword(db: Db, userId: string): Promise<boolean> {
	const res = await db
		.updateTable('User')
		.set((eb) => ({ passwordHash: null, sessionVersion: eb('sessionVersion', '+', 1) }))
		.where('id', '=', userId)
		.where('emailVerified', 'is', null)
		.where('passwordHash', 'is not', null)
		.executeTakeFirst();
	return Number(res.numUpdatedRows) > 0;
}

/**
 * A completed password reset: the new password, the address confirmed (the link came by mail),
 * every older session ended and every other open reset link of the account spent.
 */
export async function completePasswordReset(db: Db, userId: string, passwordHash: string): Promise<void> {
	await db
		.updateTable('User')
		.set((eb) => ({ passwordHash, emailVerified: eb.fn.coalesce('emailVerified', sql<Date>`now()`), sessionVersion: eb('sessionVersion', '+', 1) }))
		.where('id', '=', userId)
		.execute();
	await db.updateTable('password_reset').set({ used_at: new Date() }).where('user_id', '=', userId).where('used_at', 'is', null).execute();
}
