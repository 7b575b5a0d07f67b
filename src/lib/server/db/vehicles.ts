import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';

export function findVehiclesForTeam(db: Kysely<Database>, teamId: string) {
	return db.selectFrom('vehicle').selectAll().where('team_id', '=', teamId).where('archived_at', 'is', null).orderBy('name').execute();
}
