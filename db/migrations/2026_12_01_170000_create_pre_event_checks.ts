import { type Kysely, sql } from 'kysely';

/** Manual checklist items a team adds, and sign-offs per event and vehicle (computed or manual items). */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('team')
		.addColumn('fuse_distance_m', 'double precision', (col) =>
			col
				.notNull()
				.defaultTo(0.45)
				.check(sql`fuse_distance_m > 0 and fuse_distance_m <= 3`),
		)
		.execute();
	await db.schema
		.createTable('check_item')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('team_id', 'uuid', (col) => col.notNull().references('team.id').onDelete('cascade'))
		.addColumn('label', 'text', (col) =>
			col.notNull().check(sql`length(trim(label)) between 1 and 200`),
		)
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createTable('check_signoff')
		.addColumn('event_id', 'uuid', (col) =>
			col.notNull().references('event.id').onDelete('cascade'),
		)
		.addColumn('vehicle_id', 'uuid', (col) =>
			col.notNull().references('vehicle.id').onDelete('cascade'),
		)
		.addColumn('item_key', 'text', (col) => col.notNull())
		.addColumn('signed_by', 'text', (col) => col.references('User.id').onDelete('set null'))
		.addColumn('signed_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addColumn('note', 'text', (col) => col.notNull().defaultTo(''))
		.addPrimaryKeyConstraint('check_signoff_pk', ['event_id', 'vehicle_id', 'item_key'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('check_signoff').execute();
	await db.schema.dropTable('check_item').execute();
	await db.schema.alterTable('team').dropColumn('fuse_distance_m').execute();
}
