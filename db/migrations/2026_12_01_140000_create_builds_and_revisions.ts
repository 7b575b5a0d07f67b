import { type Kysely, sql } from 'kysely';

/**
 * One build per vehicle; its history is a chain of immutable revisions, each holding the whole
 * build document as JSONB with its schema version. The build points at its head revision.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('vehicle')
		.addColumn('owner_id', 'text', (col) => col.references('User.id').onDelete('set null'))
		.execute();

	await db.schema
		.createTable('build')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('vehicle_id', 'uuid', (col) =>
			col.notNull().unique().references('vehicle.id').onDelete('cascade'),
		)
		.addColumn('head_revision_id', 'uuid')
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();

	await db.schema
		.createTable('revision')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('build_id', 'uuid', (col) =>
			col.notNull().references('build.id').onDelete('cascade'),
		)
		.addColumn('parent_id', 'uuid', (col) => col.references('revision.id'))
		.addColumn('number', 'integer', (col) => col.notNull().check(sql`number >= 1`))
		.addColumn('schema_version', 'integer', (col) => col.notNull())
		.addColumn('document', 'jsonb', (col) => col.notNull())
		.addColumn('message', 'text', (col) =>
			col.notNull().check(sql`length(trim(message)) between 1 and 500`),
		)
		.addColumn('author_id', 'text', (col) => col.references('User.id').onDelete('set null'))
		.addColumn('restored_from_id', 'uuid', (col) => col.references('revision.id'))
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addUniqueConstraint('revision_build_number_unique', ['build_id', 'number'])
		.execute();
	await db.schema
		.createIndex('revision_build_id_index')
		.on('revision')
		.columns(['build_id', 'created_at'])
		.execute();
	await db.schema
		.alterTable('build')
		.addForeignKeyConstraint('build_head_revision_fk', ['head_revision_id'], 'revision', ['id'])
		.execute();
	// Revisions are immutable: refuse updates at the database too.
	await sql`create function revision_immutable() returns trigger language plpgsql as $$
		begin raise exception 'revisions are immutable'; end $$`.execute(db);
	await sql`create trigger revision_no_update before update on revision for each row execute function revision_immutable()`.execute(
		db,
	);
}

export async function down(db: Kysely<any>): Promise<void> {
	await sql`drop trigger if exists revision_no_update on revision`.execute(db);
	await sql`drop function if exists revision_immutable()`.execute(db);
	await db.schema.alterTable('build').dropConstraint('build_head_revision_fk').execute();
	await db.schema.dropTable('revision').execute();
	await db.schema.dropTable('build').execute();
	await db.schema.alterTable('vehicle').dropColumn('owner_id').execute();
}
