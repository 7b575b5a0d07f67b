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

/** Deletes a season with its purchases; their receipts' object keys, or null when none was found. */
export async function deleteSeason(
	db: Db,
	teamId: string,
	seasonId: string,
): Promise<string[] | null> {
	return db.transaction().execute(async (trx) => {
		const keys = (
			await trx
				.selectFrom('stored_file as f')
				.innerJoin('purchase as p', 'p.id', 'f.purchase_id')
				.select('f.object_key')
				.where('p.season_id', '=', seasonId)
				.execute()
		).map((f) => f.object_key);
		const r = await trx
			.deleteFrom('season')
			.where('team_id', '=', teamId)
			.where('id', '=', seasonId)
			.executeTakeFirst();
		return Number(r.numDeletedRows) > 0 ? keys : null;
	});
}

export async function findPurchases(db: Db, seasonId: string): Promise<PurchaseDto[]> {
	const rows = await db
		.selectFrom('purchase as p')
		.leftJoin('stored_file as f', 'f.purchase_id', 'p.id')
		.selectAll('p')
		.select('f.id as receipt_id')
		.where('p.season_id', '=', seasonId)
		.orderBy('p.bought_on')
		.orderBy('p.created_at')
		.orderBy('p.id')
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
		receiptFileId: r.receipt_id,
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

/** Deletes a purchase (its receipt's row with it); the object keys to remove, or null when none was found. */
export async function deletePurchase(
	db: Db,
	seasonId: string,
	id: string,
): Promise<string[] | null> {
	return db.transaction().execute(async (trx) => {
		const keys = await receiptKeys(trx, id);
		const r = await trx
			.deleteFrom('purchase')
			.where('season_id', '=', seasonId)
			.where('id', '=', id)
			.executeTakeFirst();
		return Number(r.numDeletedRows) > 0 ? keys : null;
	});
}

export async function findPurchase(db: Db, seasonId: string, id: string) {
	return db
		.selectFrom('purchase')
		.selectAll()
		.where('season_id', '=', seasonId)
		.where('id', '=', id)
		.executeTakeFirst();
}

async function receiptKeys(db: Db, purchaseId: string): Promise<string[]> {
	const rows = await db
		.selectFrom('stored_file')
		.select('object_key')
		.where('purchase_id', '=', purchaseId)
		.execute();
	return rows.map((r) => r.object_key);
}

/**
 * Records a purchase's receipt, replacing any it had; answers the new file's id and the object
 * keys of the receipt it replaced (to remove from storage once this has committed).
 */
export function setReceipt(
	db: Db,
	r: {
		teamId: string;
		purchaseId: string;
		objectKey: string;
		fileName: string;
		contentType: string;
		sizeBytes: number;
	},
): Promise<{ fileId: string; replaced: string[] }> {
	return db.transaction().execute(async (trx) => {
		// The purchase row is locked so two uploads at once replace one another in turn.
		await trx
			.selectFrom('purchase')
			.select('id')
			.where('id', '=', r.purchaseId)
			.forUpdate()
			.executeTakeFirstOrThrow();
		const replaced = await receiptKeys(trx, r.purchaseId);
		await trx.deleteFrom('stored_file').where('purchase_id', '=', r.purchaseId).execute();
		const row = await trx
			.insertInto('stored_file')
			.values({
				team_id: r.teamId,
				purchase_id: r.purchaseId,
				kind: 'receipt',
				object_key: r.objectKey,
				file_name: r.fileName,
				content_type: r.contentType,
				size_bytes: r.sizeBytes,
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		return { fileId: row.id, replaced };
	});
}

/** Removes a purchase's receipt; the object keys to remove from storage (none when it had none). */
export function removeReceipt(db: Db, purchaseId: string): Promise<string[]> {
	return db.transaction().execute(async (trx) => {
		const keys = await receiptKeys(trx, purchaseId);
		await trx.deleteFrom('stored_file').where('purchase_id', '=', purchaseId).execute();
		return keys;
	});
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
				.selectFrom('purchase as p')
				.leftJoin('stored_file as f', 'f.purchase_id', 'p.id')
				.selectAll('p')
				.select([
					'f.object_key as receipt_key',
					'f.file_name as receipt_name',
					'f.created_at as receipt_created_at',
				])
				.where(
					'p.season_id',
					'in',
					seasons.map((x) => x.id),
				)
				.orderBy('p.bought_on')
				.orderBy('p.created_at')
				.orderBy('p.id')
				.execute()
		: [];
	return seasons.map((x) => ({ ...x, purchases: purchases.filter((p) => p.season_id === x.id) }));
}
