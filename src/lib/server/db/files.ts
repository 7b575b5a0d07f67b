import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';

type Db = Kysely<Database>;

/** The object keys of every stored file of one run. */
export async function objectKeysOfRun(db: Db, runId: string): Promise<string[]> {
	return (await db.selectFrom('stored_file').select('object_key').where('run_id', '=', runId).execute()).map((f) => f.object_key);
}

/** Which of these object keys a stored file row still points at. */
export async function knownObjectKeys(db: Db, keys: string[]): Promise<Set<string>> {
	const known = new Set<string>();
	for (let i = 0; i < keys.length; i += 500) {
		const rows = await db.selectFrom('stored_file').select('object_key').where('object_key', 'in', keys.slice(i, i + 500)).execute();
		for (const r of rows) known.add(r.object_key);
	}
	return known;
}
