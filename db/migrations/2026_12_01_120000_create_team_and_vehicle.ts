import { type Kysely, sql } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('team')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('name', 'text', (col) =>
			col.notNull().check(sql`length(trim(name)) between 1 and 80`),
		)
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();

	await db.schema
		.createTable('vehicle')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('team_id', 'uuid', (col) => col.notNull().references('team.id').onDelete('cascade'))
		.addColumn('name', 'text', (col) =>
			col.notNull().check(sql`length(trim(name)) between 1 and 80`),
		)
		.addColumn('description', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('competition_class', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('notes', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('archived_at', 'timestamptz')
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema.createIndex('vehicle_team_id_index').on('vehicle').column('team_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('vehicle').execute();
	await db.schema.dropTable('team').execute();
}
