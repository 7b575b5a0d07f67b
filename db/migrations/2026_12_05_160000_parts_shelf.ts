import { type Kysely, sql } from 'kysely';

/**
 * A team's parts shelf: what it owns or is eyeing, each entry of a part kind the build knows with
 * the fields the engine needs (checked by the engine's own schema before it is written), a price
 * in whole minor units of the team's currency (a cable's per metre), and how many the team has.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('shelf_item')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('team_id', 'uuid', (col) => col.notNull().references('team.id').onDelete('cascade'))
		.addColumn('kind', 'text', (col) => col.notNull().check(sql`kind ~ '^[a-z]{3,20}$'`))
		.addColumn('label', 'text', (col) =>
			col.notNull().check(sql`length(trim(label)) between 1 and 80`),
		)
		.addColumn('spec', 'jsonb', (col) => col.notNull())
		.addColumn('price_minor', 'bigint', (col) =>
			col.check(sql`price_minor between 0 and 100000000000`),
		)
		.addColumn('supplier', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('link', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('owned', 'integer', (col) =>
			col
				.notNull()
				.defaultTo(0)
				.check(sql`owned between 0 and 100000`),
		)
		.addColumn('notes', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addColumn('updated_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('shelf_item_team_idx')
		.on('shelf_item')
		.columns(['team_id', 'kind', 'label'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('shelf_item').execute();
}
