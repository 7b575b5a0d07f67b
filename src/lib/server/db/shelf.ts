import { type Kysely, sql } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import type { ShelfItemInput } from '@/lib/schemas/shelf';
import type { ShelfItemDto, ShelfKind } from '@/lib/shelf-kinds';

type Db = Kysely<Database>;

/** The most entries one team's shelf holds. */
export const SHELF_LIMIT = 2000;

type Row = {
	id: string;
	kind: string;
	label: string;
	spec: unknown;
	price_minor: string | null;
	supplier: string;
	link: string;
	owned: number;
	notes: string;
	updated_at: Date;
};

export const toShelfDto = (r: Row): ShelfItemDto => ({
	id: r.id,
	kind: r.kind as ShelfKind,
	label: r.label,
	spec: r.spec as Record<string, unknown>,
	priceMinor: r.price_minor === null ? null : Number(r.price_minor),
	supplier: r.supplier,
	link: r.link,
	owned: r.owned,
	notes: r.notes,
	updatedAt: r.updated_at.toISOString(),
});

const COLUMNS = [
	'id',
	'kind',
	'label',
	'spec',
	'price_minor',
	'supplier',
	'link',
	'owned',
	'notes',
	'updated_at',
] as const;

/** An entry's columns as written (the route, the import and the backup's restore). */
export const shelfRowValues = (item: ShelfItemInput) => ({
	kind: item.kind,
	label: item.label,
	spec: JSON.stringify(item.spec),
	price_minor: item.priceMinor,
	supplier: item.supplier,
	link: item.link,
	owned: item.owned,
	notes: item.notes,
});

/** The team's shelf, by kind and name. */
export async function findShelf(db: Db, teamId: string): Promise<ShelfItemDto[]> {
	const rows = await db
		.selectFrom('shelf_item')
		.select(COLUMNS)
		.where('team_id', '=', teamId)
		.orderBy('kind')
		.orderBy('label')
		.orderBy('id')
		.execute();
	return rows.map(toShelfDto);
}

export async function countShelf(db: Db, teamId: string): Promise<number> {
	const row = await db
		.selectFrom('shelf_item')
		.select(sql<string>`count(*)`.as('n'))
		.where('team_id', '=', teamId)
		.executeTakeFirstOrThrow();
	return Number(row.n);
}

/**
 * Adds entries to the team's shelf in one transaction, all or none; null when they would take it
 * past SHELF_LIMIT. One writer per team at a time, so the limit holds however many add at once.
 */
export async function addShelfItems(
	db: Db,
	teamId: string,
	items: ShelfItemInput[],
): Promise<ShelfItemDto[] | null> {
	return db.transaction().execute(async (tx) => {
		await sql`select pg_advisory_xact_lock(hashtext(${`shelf:${teamId}`}))`.execute(tx);
		if ((await countShelf(tx, teamId)) + items.length > SHELF_LIMIT) return null;
		return insertShelfItems(tx, teamId, items);
	});
}

/** Adds entries in one statement; the caller runs it in the transaction the entries belong to. */
export async function insertShelfItems(
	db: Db,
	teamId: string,
	items: ShelfItemInput[],
): Promise<ShelfItemDto[]> {
	if (items.length === 0) return [];
	const rows = await db
		.insertInto('shelf_item')
		.values(items.map((item) => ({ team_id: teamId, ...shelfRowValues(item) })))
		.returning(COLUMNS)
		.execute();
	return rows.map(toShelfDto);
}

/**
 * Replaces an entry if it is still as the member read it (its `updated_at`); `null` when the
 * entry is gone, `'stale'` when someone saved it since.
 */
export async function updateShelfItem(
	db: Db,
	teamId: string,
	id: string,
	readAt: string,
	item: ShelfItemInput,
): Promise<ShelfItemDto | 'stale' | null> {
	return db.transaction().execute(async (tx) => {
		const current = await tx
			.selectFrom('shelf_item')
			.select(['updated_at'])
			.where('team_id', '=', teamId)
			.where('id', '=', id)
			.forUpdate()
			.executeTakeFirst();
		if (!current) return null;
		if (current.updated_at.getTime() !== new Date(readAt).getTime()) return 'stale';
		const row = await tx
			.updateTable('shelf_item')
			.set({ ...shelfRowValues(item), updated_at: sql`clock_timestamp()` })
			.where('id', '=', id)
			.returning(COLUMNS)
			.executeTakeFirstOrThrow();
		return toShelfDto(row);
	});
}

export async function findShelfItem(db: Db, teamId: string, id: string) {
	const row = await db
		.selectFrom('shelf_item')
		.select(COLUMNS)
		.where('team_id', '=', teamId)
		.where('id', '=', id)
		.executeTakeFirst();
	return row ? toShelfDto(row) : null;
}

export async function deleteShelfItem(db: Db, teamId: string, id: string): Promise<boolean> {
	const r = await db
		.deleteFrom('shelf_item')
		.where('team_id', '=', teamId)
		.where('id', '=', id)
		.executeTakeFirst();
	return Number(r.numDeletedRows) > 0;
}

/** The shelf as a backup writes it: in the order entries were made, with when. */
export async function findShelfForBackup(
	db: Db,
	teamId: string,
): Promise<Array<ShelfItemDto & { createdAt: string }>> {
	const rows = await db
		.selectFrom('shelf_item')
		.select([...COLUMNS, 'created_at'])
		.where('team_id', '=', teamId)
		.orderBy('created_at')
		.orderBy('kind')
		.orderBy('label')
		.orderBy('id')
		.execute();
	return rows.map((r) => ({ ...toShelfDto(r), createdAt: r.created_at.toISOString() }));
}
