/**
 * The demo scenario: an invented team with three vehicles. Every name and number here is made up.
 * CLI: `npm run db:seed` seeds DATABASE_URL (or the embedded cluster) when it holds no team yet.
 */
import { randomUUID } from 'node:crypto';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Kysely } from 'kysely';
import { createDb } from '../src/lib/server/db/client';
import { hashPassword } from '../src/lib/server/passwords';
import { DEFAULT_CLUSTER, ensureCluster } from './cluster';
import { migrateToLatest } from './migrator';
import { DEMO_BUILDS, DEMO_HISTORIES } from './demo/builds';
import type { Database } from './schema';

export const DEMO_TEAM_NAME = 'Harbour Street Sag Club';

export const DEMO_VEHICLES = [
	{
		name: 'Pebble',
		description: 'Small grey hatchback, daily driver',
		competition_class: 'Street 1 (up to 2 kW)',
		notes: 'Stock 90 A alternator and its one AGM under the hood. Keeps its back seat.',
	},
	{
		name: 'Marlin',
		description: 'Mid-size sedan, weekend build',
		competition_class: 'Street 3 (up to 6 kW)',
		notes: 'High-output alternator, two AGM banks, 1/0 runs front to back.',
	},
	{
		name: 'Old Oak',
		description: 'Long-roof estate wagon, the team flagship',
		competition_class: 'Extreme (unlimited)',
		notes: 'Two alternators, LiFePO4 16 V banks, 4/0 runs. Trailered to events.',
	},
] as const;

/** Demo accounts, one per role. The password is printed by `npm start`; it is for local use only. */
export const DEMO_PASSWORD = 'sagwise-demo-2026';
export const DEMO_USERS = [
	{ email: 'captain@sagwise.test', name: 'Demo Captain', role: 'captain' },
	{ email: 'member@sagwise.test', name: 'Demo Member', role: 'member' },
	{ email: 'viewer@sagwise.test', name: 'Demo Viewer', role: 'viewer' },
] as const;

/** Writes the demo scenario in one transaction. Returns the team id. */
export async function seedDemo(db: Kysely<Database>): Promise<string> {
	const passwordHash = await hashPassword(DEMO_PASSWORD);
	return db.transaction().execute(async (trx) => {
		const team = await trx.insertInto('team').values({ name: DEMO_TEAM_NAME }).returning('id').executeTakeFirstOrThrow();
		const userIds: string[] = [];
		for (const u of DEMO_USERS) {
			const user = await trx
				.insertInto('User')
				.values({ id: randomUUID(), email: u.email, name: u.name, passwordHash, emailVerified: new Date() })
				.returning('id')
				.executeTakeFirstOrThrow();
			userIds.push(user.id);
			await trx.insertInto('membership').values({ team_id: team.id, user_id: user.id, role: u.role }).execute();
		}
		for (const [i, v] of DEMO_VEHICLES.entries()) {
			const vehicle = await trx
				.insertInto('vehicle')
				.values({ ...v, team_id: team.id, owner_id: userIds[i % 2]! })
				.returning('id')
				.executeTakeFirstOrThrow();
			const build = await trx.insertInto('build').values({ vehicle_id: vehicle.id }).returning('id').executeTakeFirstOrThrow();
			let parentId: string | null = null;
			for (const [n, r] of DEMO_HISTORIES[v.name].entries()) {
				const rev: { id: string } = await trx
					.insertInto('revision')
					.values({
						build_id: build.id,
						parent_id: parentId,
						number: n + 1,
						schema_version: r.document.schemaVersion,
						document: JSON.stringify(r.document),
						message: r.message,
						author_id: userIds[r.author]!,
						created_at: new Date(Date.now() - r.daysAgo * 86_400_000),
					})
					.returning('id')
					.executeTakeFirstOrThrow();
				parentId = rev.id;
			}
			await trx.updateTable('build').set({ head_revision_id: parentId }).where('id', '=', build.id).execute();
			void DEMO_BUILDS;
		}
		return team.id;
	});
}

/** Seeds only an empty database (no team yet); returns whether it seeded. */
export async function seedIfEmpty(db: Kysely<Database>): Promise<boolean> {
	const { count } = await db.selectFrom('team').select((eb) => eb.fn.countAll<number>().as('count')).executeTakeFirstOrThrow();
	if (Number(count) > 0) return false;
	await seedDemo(db);
	return true;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
	const url = process.env.DATABASE_URL ?? (await ensureCluster(DEFAULT_CLUSTER)).url(DEFAULT_CLUSTER.database);
	const db = createDb(url, 1);
	try {
		await migrateToLatest(db);
		console.log((await seedIfEmpty(db)) ? 'demo data written' : 'database already has data; nothing written');
	} finally {
		await db.destroy();
	}
}
