import { type Kysely, Migrator } from 'kysely';
import { migrations } from './migrations/index';

export function createMigrator(db: Kysely<any>): Migrator {
	return new Migrator({ db, provider: { getMigrations: async () => migrations } });
}

/** Migrates to the latest version; throws with the failing migration's name on error. */
export async function migrateToLatest(
	db: Kysely<any>,
	log: (line: string) => void = () => {},
): Promise<void> {
	const { error, results } = await createMigrator(db).migrateToLatest();
	for (const result of results ?? []) {
		log(
			`${result.status === 'Success' ? 'applied' : result.status.toLowerCase()}: ${result.migrationName}`,
		);
	}
	if (error) throw error instanceof Error ? error : new Error(String(error));
}
