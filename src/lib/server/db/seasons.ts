import { type Kysely, sql } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import type {
	NewPurchaseInput,
	NewSeasonInput,
	PurchaseDto,
	SeasonDto,
} from '@/lib/schemas/seasons';

type Db = Kysely<Database>;

/** The team's seasons, latest first, each with what was spent in it (exact, in SQL). */
export async function findSeasons(db: Db, teamId: string): Promise<SeasonDto[]> {
	const rows = await db
		.selectFrom('season as s')
		.select((eb) => [
			's.id',
			's.name',
			's.starts_on',
			's.ends_on',
			's.budget_minor',
			eb
				.selectFrom('purchase as p')
				.select(sql<string>`coalesce(sum(p.quantity * p.unit_price_minor), 0)`.as('n'))
				.whereRef('p.season_id', '=', 's.id')
				.as('spent_minor'),
		])
		.where('s.team_id', '=', teamId)
		.orderBy('s.starts_on', 'desc')
		.orderBy('s.id')
		.execute();
	return rows.map((r) => ({
		id: r.id,
		name: r.name,
		startsOn: r.starts_on,
		endsOn: r.ends_on,
		budgetMinor: Number(r.budget_minor),
		spentMinor: Number(r.spent_minor ?? 0),
	}));
}

export async function findSeason(db: Db, teamId: string, seasonId: string) {
	return (await findSeasons(db, teamId)).find((s) => s.id === seasonId) ?? null;
}

export async function insertSeason(db: Db, teamId: string, s: NewSeasonInput): Promise<string> {
	const row = await db
		.insertInto('season')
		.values({
			team_id: teamId,
			name: s.name,
			starts_on: s.startsOn,
			ends_on: s.endsOn,
			budget_minor: s.budgetMinor,
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	return row.id;
}

export async function deleteSeason(db: Db, teamId: string, seasonId: string): Promise<boolean> {
	const r = await db
		.deleteFrom('season')
		.where('team_id', '=', teamId)
		.where('id', '=', seasonId)
		.executeTakeFirst();
	return Number(r.numDeletedRows) > 0;
}

export async function findPurchases(db: Db, seasonId: string): Promise<PurchaseDto[]> {
	const rows = await db
		.selectFrom('purchase')
		.selectAll()
		.where('season_id', '=', seasonId)
		.orderBy('bought_on')
		.orderBy('created_at')
		.orderBy('id')
		.execute();
	return rows.map((r) => ({
		id: r.id,
		boughtOn: r.bought_on,
		shelfItemId: r.shelf_item_id,
		item: r.item,
		quantity: r.quantity,
		unitPriceMinor: Number(r.unit_price_minor),
		paidBy: r.paid_by,
		paidByName: r.paid_by_name,
		notes: r.notes,
	}));
}

export async function insertPurchase(
	db: Db,
	seasonId: string,
	p: NewPurchaseInput & { paidByName: string; createdBy: string },
): Promise<string> {
	const row = await db
		.insertInto('purchase')
		.values({
			season_id: seasonId,
			bought_on: p.boughtOn,
			shelf_item_id: p.shelfItemId,
			item: p.item,
			quantity: p.quantity,
			unit_price_minor: p.unitPriceMinor,
			paid_by: p.paidBy,
			paid_by_name: p.paidByName,
			notes: p.notes,
			created_by: p.createdBy,
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	return row.id;
}

export async function deletePurchase(db: Db, seasonId: string, id: string): Promise<boolean> {
	const r = await db
		.deleteFrom('purchase')
		.where('season_id', '=', seasonId)
		.where('id', '=', id)
		.executeTakeFirst();
	return Number(r.numDeletedRows) > 0;
}

/**
 * Plans not yet installed on the team's vehicles, with their parts' totals: money committed but
 * not spent, to weigh against what is left of a budget.
 */
export async function findCommittedPlans(db: Db, teamId: string) {
	const rows = await db
		.selectFrom('plan as p')
		.innerJoin('vehicle as v', 'v.id', 'p.vehicle_id')
		.select((eb) => [
			'p.id',
			'p.name',
			'v.id as vehicle_id',
			'v.name as vehicle_name',
			eb
				.selectFrom('plan_part as pp')
				.select(sql<string>`coalesce(sum(pp.quantity * pp.unit_price_minor), 0)`.as('n'))
				.whereRef('pp.plan_id', '=', 'p.id')
				.as('total_minor'),
		])
		.where('v.team_id', '=', teamId)
		.where('p.installed_at', 'is', null)
		.orderBy('v.name')
		.orderBy('p.name')
		.execute();
	return rows.map((r) => ({
		id: r.id,
		name: r.name,
		vehicleId: r.vehicle_id,
		vehicleName: r.vehicle_name,
		totalMinor: Number(r.total_minor ?? 0),
	}));
}

/** Every season of the team with its purchases' rows, in a fixed order, for the team backup. */
export async function findSeasonsForBackup(db: Db, teamId: string) {
	const seasons = await db
		.selectFrom('season')
		.selectAll()
		.where('team_id', '=', teamId)
		.orderBy('starts_on')
		.orderBy('name')
		.orderBy('id')
		.execute();
	const purchases = seasons.length
		? await db
				.selectFrom('purchase')
				.selectAll()
				.where(
					'season_id',
					'in',
					seasons.map((x) => x.id),
				)
				.orderBy('bought_on')
				.orderBy('created_at')
				.orderBy('id')
				.execute()
		: [];
	return seasons.map((x) => ({ ...x, purchases: purchases.filter((p) => p.season_id === x.id) }));
}
