import { randomUUID } from 'node:crypto';
import { type Kysely, sql } from 'kysely';
import type { Database, RateEventTable, UserRow } from '@/lib/server/db/schema';
import { forgetSessionsOf } from '@/lib/server/session-cache';

type Db = Kysely<Database>;

export function findUserByEmail(db: Db, email: string): Promise<UserRow | undefined> {
	return db
		.selectFrom('User')
		.selectAll()
		.where('email', '=', email.toLowerCase())
		.executeTakeFirst();
}

export function findUserById(db: Db, id: string): Promise<UserRow | undefined> {
	return db.selectFrom('User').selectAll().where('id', '=', id).executeTakeFirst();
}

/** Inserts a user; returns undefined when the address is already taken (unique violation). */
export async function insertUser(
	db: Db,
	user: { email: string; name: string; passwordHash: string | null },
): Promise<UserRow | undefined> {
	return db
		.insertInto('User')
		.values({
			id: randomUUID(),
			email: user.email.toLowerCase(),
			name: user.name,
			passwordHash: user.passwordHash,
		})
		.onConflict((oc) => oc.column('email').doNothing())
		.returningAll()
		.executeTakeFirst();
}

// ---- password resets

export async function insertPasswordReset(
	db: Db,
	userId: string,
	tokenHash: string,
	ttlMs: number,
): Promise<void> {
	await db
		.insertInto('password_reset')
		.values({ user_id: userId, token_hash: tokenHash, expires_at: new Date(Date.now() + ttlMs) })
		.execute();
}

export type ConsumeResult =
	{ ok: true; userId: string } | { ok: false; reason: 'unknown' | 'used' | 'expired' };

/** Marks a reset token used, once, in the caller's transaction (row-locked so two requests cannot both use it). */
export async function consumePasswordReset(db: Db, tokenHash: string): Promise<ConsumeResult> {
	const row = await db
		.selectFrom('password_reset')
		.selectAll()
		.where('token_hash', '=', tokenHash)
		.forUpdate()
		.executeTakeFirst();
	if (!row) return { ok: false, reason: 'unknown' };
	if (row.used_at) return { ok: false, reason: 'used' };
	if (row.expires_at.getTime() < Date.now()) return { ok: false, reason: 'expired' };
	await db
		.updateTable('password_reset')
		.set({ used_at: new Date() })
		.where('id', '=', row.id)
		.execute();
	return { ok: true, userId: row.user_id };
}

// ---- sign-in attempts (rate limiting, shared by every app instance through PostgreSQL)

export async function recordSignInAttempt(
	db: Db,
	email: string,
	client: string,
	succeeded: boolean,
): Promise<void> {
	await db
		.insertInto('sign_in_attempt')
		.values({ email: email.toLowerCase(), client, succeeded })
		.execute();
}

export async function countRecentFailures(
	db: Db,
	by: { email?: string; client?: string },
	windowMs: number,
): Promise<number> {
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
	const row = await db
		.selectFrom('User')
		.select('sessionVersion')
		.where('id', '=', userId)
		.executeTakeFirst();
	return row ? row.sessionVersion : null;
}

/** Ends every session of the account (they are checked against this version on each request). */
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
	const ended = Number(res.numUpdatedRows) > 0;
	if (ended) forgetSessionsOf(userId);
	return ended;
}

/**
 * A completed password reset: the new password, the address confirmed (the link came by mail),
 * every older session ended and every other open reset link of the account spent.
 */
export async function completePasswordReset(
	db: Db,
	userId: string,
	passwordHash: string,
): Promise<void> {
	await db
		.updateTable('User')
		.set((eb) => ({
			passwordHash,
			emailVerified: eb.fn.coalesce('emailVerified', sql<Date>`now()`),
			sessionVersion: eb('sessionVersion', '+', 1),
		}))
		.where('id', '=', userId)
		.execute();
	forgetSessionsOf(userId);
	await db
		.updateTable('password_reset')
		.set({ used_at: new Date() })
		.where('user_id', '=', userId)
		.where('used_at', 'is', null)
		.execute();
}

export async function setUnitSystem(
	db: Db,
	userId: string,
	unitSystem: 'imperial' | 'metric',
): Promise<void> {
	await db.updateTable('User').set({ unitSystem }).where('id', '=', userId).execute();
}

/** How many times this kind of action was tried for an address, and from a client, within the window. */
export async function countRateEvents(
	db: Db,
	kind: RateEventTable['kind'],
	email: string,
	client: string,
	windowMs: number,
): Promise<{ byEmail: number; byClient: number }> {
	const since = sql<boolean>`created_at > now() - make_interval(secs => ${windowMs / 1000})`;
	const row = (await db
		.selectNoFrom((eb) => [
			eb
				.selectFrom('rate_event')
				.select((e) => e.fn.countAll<number>().as('n'))
				.where('kind', '=', kind)
				.where('email', '=', email.toLowerCase())
				.where(since)
				.as('byEmail'),
			eb
				.selectFrom('rate_event')
				.select((e) => e.fn.countAll<number>().as('n'))
				.where('kind', '=', kind)
				.where('client', '=', client)
				.where(since)
				.as('byClient'),
		])
		.executeTakeFirstOrThrow()) as { byEmail: number; byClient: number };
	return { byEmail: Number(row.byEmail), byClient: Number(row.byClient) };
}

export async function recordRateEvent(
	db: Db,
	kind: RateEventTable['kind'],
	email: string,
	client: string,
): Promise<void> {
	await db.insertInto('rate_event').values({ kind, email: email.toLowerCase(), client }).execute();
}

/**
 * Sets a new password with a reset token, in one transaction: the token is spent (single use,
 * expiring), every older session ends, every other open reset link is spent, the address is confirmed.
 */
export function resetPassword(
	db: Db,
	tokenHash: string,
	passwordHash: string,
): Promise<ConsumeResult> {
	return db.transaction().execute(async (trx) => {
		const consumed = await consumePasswordReset(trx, tokenHash);
		if (consumed.ok) await completePasswordReset(trx, consumed.userId, passwordHash);
		return consumed;
	});
}
