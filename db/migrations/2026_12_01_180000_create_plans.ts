import { type Kysely, sql } from 'kysely';

/**
 * What-if plans per vehicle: a build document started from a revision, with a parts list priced in
 * the team's currency. Prices are whole minor units (cents) so totals add up exactly.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('team')
		.addColumn('currency', 'text', (col) =>
			col
				.notNull()
				.defaultTo('USD')
				.check(sql`currency ~ '^[A-Z]{3}$'`),
		)
		.execute();
	await db.schema
		.createTable('plan')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('vehicle_id', 'uuid', (col) =>
			col.notNull().references('vehicle.id').onDelete('cascade'),
		)
		.addColumn('name', 'text', (col) =>
			col.notNull().check(sql`length(trim(name)) between 1 and 120`),
		)
		.addColumn('notes', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('base_revision_id', 'uuid', (col) =>
			col.references('revision.id').onDelete('set null'),
		)
		.addColumn('schema_version', 'integer', (col) => col.notNull())
		.addColumn('document', 'jsonb', (col) => col.notNull())
		.addColumn('version', 'integer', (col) => col.notNull().defaultTo(1))
		.addColumn('created_by', 'text', (col) => col.references('User.id').onDelete('set null'))
		.addColumn('installed_revision_id', 'uuid', (col) =>
			col.references('revision.id').onDelete('set null'),
		)
		.addColumn('installed_at', 'timestamptz')
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addColumn('updated_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema.createIndex('plan_vehicle_idx').on('plan').column('vehicle_id').execute();
	await db.schema
		.createTable('plan_part')
		.addColumn('plan_id', 'uuid', (col) => col.notNull().references('plan.id').onDelete('cascade'))
		.addColumn('position', 'integer', (col) => col.notNull().check(sql`position >= 0`))
		.addColumn('item', 'text', (col) =>
			col.notNull().check(sql`length(trim(item)) between 1 and 200`),
		)
		.addColumn('quantity', 'integer', (col) =>
			col.notNull().check(sql`quantity between 1 and 10000`),
		)
		.addColumn('unit_price_minor', 'bigint', (col) =>
			col.notNull().check(sql`unit_price_minor between 0 and 100000000000`),
		)
		.addColumn('link', 'text', (col) => col.notNull().defaultTo(''))
		.addPrimaryKeyConstraint('plan_part_pk', ['plan_id', 'position'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('plan_part').execute();
	await db.schema.dropTable('plan').execute();
	await db.schema.alterTable('team').dropColumn('currency').execute();
}
