import { type Kysely, sql } from 'kysely';

/** The team calendar, runs logged against the revision in force, stored files and logger samples. */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('event')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('team_id', 'uuid', (col) => col.notNull().references('team.id').onDelete('cascade'))
		.addColumn('name', 'text', (col) =>
			col.notNull().check(sql`length(trim(name)) between 1 and 120`),
		)
		.addColumn('starts_on', 'date', (col) => col.notNull())
		.addColumn('ends_on', 'date', (col) => col.notNull())
		.addColumn('place', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('format', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('notes', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addCheckConstraint('event_dates_ordered', sql`ends_on >= starts_on`)
		.execute();
	await db.schema
		.createIndex('event_team_starts_index')
		.on('event')
		.columns(['team_id', 'starts_on'])
		.execute();

	await db.schema
		.createTable('run')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('vehicle_id', 'uuid', (col) =>
			col.notNull().references('vehicle.id').onDelete('cascade'),
		)
		.addColumn('event_id', 'uuid', (col) => col.references('event.id').onDelete('set null'))
		.addColumn('revision_id', 'uuid', (col) => col.references('revision.id'))
		.addColumn('ran_at', 'timestamptz', (col) => col.notNull())
		.addColumn('score_db', 'double precision', (col) => col.check(sql`score_db between 0 and 200`))
		.addColumn('frequency_hz', 'double precision', (col) => col.check(sql`frequency_hz > 0`))
		.addColumn('resting_v', 'double precision')
		.addColumn('min_v', 'double precision')
		.addColumn('ambient_c', 'double precision')
		.addColumn('notes', 'text', (col) => col.notNull().defaultTo(''))
		.addColumn('author_id', 'text', (col) => col.references('User.id').onDelete('set null'))
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('run_vehicle_ran_index')
		.on('run')
		.columns(['vehicle_id', 'ran_at'])
		.execute();

	await db.schema
		.createTable('stored_file')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('team_id', 'uuid', (col) => col.notNull().references('team.id').onDelete('cascade'))
		.addColumn('run_id', 'uuid', (col) => col.references('run.id').onDelete('cascade'))
		.addColumn('kind', 'text', (col) =>
			col.notNull().check(sql`kind in ('logger', 'photo', 'thumbnail')`),
		)
		.addColumn('object_key', 'text', (col) => col.notNull().unique())
		.addColumn('file_name', 'text', (col) => col.notNull())
		.addColumn('content_type', 'text', (col) => col.notNull())
		.addColumn('size_bytes', 'integer', (col) => col.notNull())
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();

	await db.schema
		.createTable('run_sample')
		.addColumn('run_id', 'uuid', (col) => col.notNull().references('run.id').onDelete('cascade'))
		.addColumn('seq', 'integer', (col) => col.notNull())
		.addColumn('t_s', 'double precision', (col) => col.notNull())
		.addColumn('volts', 'double precision', (col) => col.notNull())
		.addColumn('amps', 'double precision', (col) => col.notNull())
		.addPrimaryKeyConstraint('run_sample_pk', ['run_id', 'seq'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const t of ['run_sample', 'stored_file', 'run', 'event'])
		await db.schema.dropTable(t).execute();
}
