/**
 * The demo scenario: an invented team with three vehicles. Every name and number here is made up.
 * CLI: `npm run db:seed` seeds DATABASE_URL (or the embedded cluster) when it holds no team yet.
 */
import { randomUUID } from 'node:crypto';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Kysely } from 'kysely';
import { createDb } from '../src/lib/server/db/client';
import { measurementColumns } from '../src/lib/schemas/run-measurements';
import { storeLoggerSummary } from '../src/lib/server/db/runs';
import { hashPassword } from '../src/lib/server/passwords';
import { DEFAULT_CLUSTER, ensureCluster } from './cluster';
import { migrateToLatest } from './migrator';
import { DEMO_BUILDS, DEMO_HISTORIES } from './demo/builds';
import { DEMO_PLANS } from './demo/plans';
import { DEMO_SEASON, DEMO_SHELF } from './demo/shelf';
import { seedDemoComments } from './demo/comments';
import { DEMO_EVENTS, DEMO_RUNS, demoTrace } from './demo/runs';
import type { Storage } from '../src/lib/server/storage';
import type { Database } from '../src/lib/server/db/schema';

export const DEMO_TEAM_NAME = 'Harbour Street Sag Club';

export const DEMO_VEHICLES = [
	{
		name: 'Pebble',
		description: 'Small grey hatchback, daily driver',
		competition_class: 'Commuter (up to 2 kW)',
		notes: 'Stock 105 A alternator and its one AGM under the hood. Keeps its back seat.',
	},
	{
		name: 'Marlin',
		description: 'Mid-size sedan, weekend build',
		competition_class: 'Club (up to 6 kW)',
		notes: 'High-output alternator, two AGM banks, 1/0 runs front to back.',
	},
	{
		name: 'Old Oak',
		description: 'Long-roof estate wagon, the team flagship',
		competition_class: 'Unbounded (no power limit)',
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

/** A demo day at an hour (UTC): the demo season has fixed dates, not dates relative to today. */
const at = (isoDay: string, hour: number) =>
	new Date(`${isoDay}T${String(hour).padStart(2, '0')}:00:00Z`);
const plusDays = (isoDay: string, days: number) =>
	new Date(at(isoDay, 12).getTime() + days * 86_400_000).toISOString().slice(0, 10);

/**
 * Writes the demo scenario in one transaction (logger files go to storage when one is given).
 * Returns the team id.
 */
export async function seedDemo(db: Kysely<Database>, storage?: Storage): Promise<string> {
	const passwordHash = await hashPassword(DEMO_PASSWORD);
	return db.transaction().execute(async (trx) => {
		const team = await trx
			.insertInto('team')
			.values({ name: DEMO_TEAM_NAME })
			.returning('id')
			.executeTakeFirstOrThrow();
		const userIds: string[] = [];
		for (const u of DEMO_USERS) {
			const user = await trx
				.insertInto('User')
				.values({
					id: randomUUID(),
					email: u.email,
					name: u.name,
					passwordHash,
					emailVerified: new Date(),
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			userIds.push(user.id);
			await trx
				.insertInto('membership')
				.values({ team_id: team.id, user_id: user.id, role: u.role })
				.execute();
		}
		for (const [i, v] of DEMO_VEHICLES.entries()) {
			const vehicle = await trx
				.insertInto('vehicle')
				.values({ ...v, team_id: team.id, owner_id: userIds[i % 2]! })
				.returning('id')
				.executeTakeFirstOrThrow();
			const build = await trx
				.insertInto('build')
				.values({ vehicle_id: vehicle.id })
				.returning('id')
				.executeTakeFirstOrThrow();
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
						created_at: at(r.on, 9),
					})
					.returning('id')
					.executeTakeFirstOrThrow();
				parentId = rev.id;
			}
			await trx
				.updateTable('build')
				.set({ head_revision_id: parentId })
				.where('id', '=', build.id)
				.execute();
			void DEMO_BUILDS;
		}
		const eventIds = new Map<string, string>();
		for (const e of DEMO_EVENTS) {
			const row = await trx
				.insertInto('event')
				.values({
					team_id: team.id,
					name: e.name,
					starts_on: e.on,
					ends_on: plusDays(e.on, e.days - 1),
					place: e.place,
					format: e.format,
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			eventIds.set(e.key, row.id);
		}
		for (const r of DEMO_RUNS) {
			const vehicle = await trx
				.selectFrom('vehicle as v')
				.innerJoin('build as b', 'b.vehicle_id', 'v.id')
				.select(['v.id', 'b.id as build_id'])
				.where('v.team_id', '=', team.id)
				.where('v.name', '=', r.vehicle)
				.executeTakeFirstOrThrow();
			const ranAt = at(r.on, 14);
			const rev = await trx
				.selectFrom('revision')
				.select('id')
				.where('build_id', '=', vehicle.build_id)
				.where('created_at', '<=', ranAt)
				.orderBy('created_at', 'desc')
				.limit(1)
				.executeTakeFirst();
			const run = await trx
				.insertInto('run')
				.values({
					vehicle_id: vehicle.id,
					event_id: r.event ? eventIds.get(r.event)! : null,
					revision_id: rev?.id ?? null,
					ran_at: ranAt,
					ran_at_offset_min: 0,
					...measurementColumns(r),
					author_id: userIds[1]!,
					// Logged a quarter of an hour after the run, at the lanes.
					created_at: new Date(ranAt.getTime() + 15 * 60_000),
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			if (r.logger) {
				const trace = demoTrace(r);
				await trx
					.insertInto('run_sample')
					.values(
						trace.map((s, i) => ({
							run_id: run.id,
							seq: i,
							t_s: s.tS,
							volts: s.volts,
							amps: s.amps,
						})),
					)
					.execute();
				await storeLoggerSummary(trx, run.id, trace);
				if (storage) {
					const csv = `time_s,volts,amps\n${trace.map((s) => `${s.tS},${s.volts},${s.amps}`).join('\n')}\n`;
					const key = `teams/${team.id}/runs/${run.id}/logger-demo.csv`;
					await storage.put(key, new TextEncoder().encode(csv), 'text/csv');
					await trx
						.insertInto('stored_file')
						.values({
							team_id: team.id,
							run_id: run.id,
							kind: 'logger',
							object_key: key,
							file_name: 'logger.csv',
							content_type: 'text/csv',
							size_bytes: csv.length,
						})
						.execute();
				}
			}
		}
		for (const p of DEMO_PLANS) {
			const vehicle = await trx
				.selectFrom('vehicle as v')
				.innerJoin('build as b', 'b.vehicle_id', 'v.id')
				.select(['v.id', 'b.head_revision_id'])
				.where('v.team_id', '=', team.id)
				.where('v.name', '=', p.vehicle)
				.executeTakeFirstOrThrow();
			const plan = await trx
				.insertInto('plan')
				.values({
					vehicle_id: vehicle.id,
					name: p.name,
					notes: p.notes,
					base_revision_id: vehicle.head_revision_id,
					schema_version: p.document.schemaVersion,
					document: JSON.stringify(p.document),
					created_by: userIds[p.author]!,
					created_at: at(p.on, 18),
					updated_at: at(p.on, 18),
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			await trx
				.insertInto('plan_part')
				.values(
					p.parts.map((part, position) => ({
						plan_id: plan.id,
						position,
						item: part.item,
						quantity: part.quantity,
						unit_price_minor: Math.round(part.unitPrice * 100),
						link: part.link,
					})),
				)
				.execute();
		}
		const shelfRows = await trx
			.insertInto('shelf_item')
			.values(
				DEMO_SHELF.map((x, i) => ({
					team_id: team.id,
					kind: x.kind,
					label: x.label,
					spec: JSON.stringify(x.spec),
					price_minor: x.priceMinor,
					supplier: x.supplier,
					owned: x.owned,
					notes: x.notes,
					created_at: at('2026-08-01', 9 + i),
					updated_at: at('2026-08-01', 9 + i),
				})),
			)
			.returning(['id', 'label'])
			.execute();
		const season = await trx
			.insertInto('season')
			.values({
				team_id: team.id,
				name: DEMO_SEASON.name,
				starts_on: DEMO_SEASON.startsOn,
				ends_on: DEMO_SEASON.endsOn,
				budget_minor: DEMO_SEASON.budgetMinor,
				created_at: at(DEMO_SEASON.startsOn, 9),
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await trx
			.insertInto('purchase')
			.values(
				DEMO_SEASON.purchases.map((p) => ({
					season_id: season.id,
					bought_on: p.on,
					shelf_item_id: shelfRows.find((r) => r.label === p.shelf)?.id ?? null,
					item: p.item,
					quantity: p.quantity,
					unit_price_minor: p.unitPriceMinor,
					paid_by: userIds[p.payer]!,
					paid_by_name: DEMO_USERS[p.payer]!.name,
					notes: p.notes,
					created_by: userIds[p.payer]!,
					created_at: at(p.on, 18),
				})),
			)
			.execute();
		await trx
			.insertInto('check_item')
			.values([
				{ team_id: team.id, label: 'Battery hold-downs torqued and terminal covers on' },
				{ team_id: team.id, label: 'Main fuse holders closed, spare fuses in the kit' },
			])
			.execute();
		await seedDemoComments(
			trx,
			team.id,
			DEMO_USERS.map((u, i) => ({ id: userIds[i]!, name: u.name })),
		);
		return team.id;
	});
}

/** Seeds only an empty database (no team yet); returns whether it seeded. */
export async function seedIfEmpty(db: Kysely<Database>, storage?: Storage): Promise<boolean> {
	const { count } = await db
		.selectFrom('team')
		.select((eb) => eb.fn.countAll<number>().as('count'))
		.executeTakeFirstOrThrow();
	if (Number(count) > 0) return false;
	await seedDemo(db, storage);
	return true;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
	const url =
		process.env.DATABASE_URL ??
		(await ensureCluster(DEFAULT_CLUSTER)).url(DEFAULT_CLUSTER.database);
	const db = createDb(url, 1);
	try {
		await migrateToLatest(db);
		console.log(
			(await seedIfEmpty(db)) ? 'demo data written' : 'database already has data; nothing written',
		);
	} finally {
		await db.destroy();
	}
}
