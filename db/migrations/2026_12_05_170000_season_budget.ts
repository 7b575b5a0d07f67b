import { type Kysely, sql } from 'kysely';

/**
 * A team's seasons, each with a budget, and the purchases made in it: what was bought (a shelf
 * entry or free text), how many at what unit price, and who paid. Money is whole minor units of
 * the team's currency, so every total and every member's share adds up exactly.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('season')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('team_id', 'uuid', (col) => col.notNull().references('team.id').onDelete('cascade'))
		.addColumn('name', 'text', (col) =>
			col.notNull().check(sql`length(trim(name)) between 1 and 80`),
		)
		.addColumn('starts_on', 'date', (col) => col.notNull())
		.addColumn('ends_on', 'date', (col) => col.notNull())
		.addColumn('budget_minor', 'bigint', (col) =>
			col.notNull().check(sql`budget_minor between 0 and 100000000000`),
		)
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addCheckConstraint('season_dates', sql`ends_on >= starts_on`)
		.execute();
	await db.schema
		.createIndex('season_team_idx')
		.on('season')
		.columns(['team_id', 'starts_on'])
		.execute();
	await db.schema
		.createTable('purchase')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('season_id', 'uuid', (col) =>
			col.notNull().references('season.id').onDelete('cascade'),
		)
		.addColumn('bought_on', 'date', (col) => col.notNull())
		.addColumn('shelf_item_id', 'uuid', (col) =>
			col.references('shelf_item.id').onDelete('set null'),
		)
		.addColumn('item', 'text', (col) =>
			col.notNull().check(sql`length(trim(item)) between 1 and 200`),
		)
		.addColumn('quantity', 'integer', (col) =>
			col.notNull().check(sql`quantity between 1 and 10000`),
		)
		.addColumn('unit_price_minor', 'bigint', (col) =>
			col.notNull().check(sql`unit_price_minor between 0 and 100000000000`),
		)
		.addColumn('paid_by', 'text', (col) => col.references('User.id').onDelete('set null'))
		/** Who paid as the team knew them when it was recorded (kept if the account goes). */
		.addColumn('paid_by_name', 'text', (col) => col.notNull().defaultTo(''))
		/** Who paid, as a restored backup recorded them (their address; never a live account here). */
		.addColumn('imported_by', 'text')
		.addColumn('notes', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('created_by', 'text', (col) => col.references('User.id').onDelete('set null'))
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('purchase_season_idx')
		.on('purchase')
		.columns(['season_id', 'bought_on'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('purchase').execute();
	await db.schema.dropTable('season').execute();
}
