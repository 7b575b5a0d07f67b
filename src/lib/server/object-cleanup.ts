import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import { knownObjectKeys } from './db/files';
import type { Storage } from './storage';
import { errorField, log } from './log';

/**
 * Every object a team owns lives under `teams/<team id>/` (the server makes every key itself), so
 * a deleted team's files go with one listing. Best effort: whatever the store refuses now is an
 * object without a row, which the sweep below removes later.
 */
export async function removeTeamObjects(storage: Storage, teamId: string): Promise<number> {
	let removed = 0;
	try {
		for (const o of await storage.list(`teams/${teamId}/`)) {
			await storage.remove(o.key);
			removed++;
		}
	} catch (error) {
		log.warn({ teamId, err: errorField(error) }, 'stored files left for the sweep');
	}
	return removed;
}

/** Removes objects by key, best effort (rows are gone already; the sweep catches what fails). */
export async function removeObjects(storage: Storage, keys: string[]): Promise<void> {
	for (const key of keys)
		await storage
			.remove(key)
			.catch((error) =>
				log.warn({ key, err: errorField(error) }, 'stored file left for the sweep'),
			);
}

/** An object younger than this may belong to an upload whose row is not committed yet. */
export const ORPHAN_GRACE_MS = 60 * 60_000;

/**
 * Removes stored objects no row points at (an import or upload that died between writing a file
 * and committing its row, a deletion the store refused): only under `teams/`, only older than the
 * grace period. Safe to run on several machines at once (removing a missing object is a no-op).
 */
export async function sweepOrphanObjects(
	db: Kysely<Database>,
	storage: Storage,
	now = Date.now(),
	graceMs = ORPHAN_GRACE_MS,
): Promise<number> {
	const candidates = (await storage.list('teams/'))
		.filter((o) => o.lastModified === null || now - o.lastModified.getTime() > graceMs)
		.map((o) => o.key);
	const known = await knownObjectKeys(db, candidates);
	const orphans = candidates.filter((k) => !known.has(k));
	for (const key of orphans) await storage.remove(key);
	return orphans.length;
}
