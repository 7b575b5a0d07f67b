import { type Kysely, sql } from 'kysely';

/**
 * Hardening: a session version per account (a password reset or a first e-mail sign-in ends every
 * older session), a log of rate-limited actions (reset mails, sign-in link mails, sign-ups) counted
 * per address and per client, and "as recorded in the file" names for authors, owners and
 * sign-offs restored from a backup, which never map to a live account of this installation.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('User')
		.addColumn('sessionVersion', 'integer', (col) => col.notNull().defaultTo(0))
		.execute();

	await db.schema
		.createTable('rate_event')
		.addColumn('id', 'bigserial', (col) => col.primaryKey())
		.addColumn('kind', 'text', (col) =>
			col.notNull().check(sql`kind in ('reset_mail', 'link_mail', 'sign_up')`),
		)
		.addColumn('email', 'text', (col) => col.notNull())
		.addColumn('client', 'text', (col) => col.notNull())
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('rate_event_email_index')
		.on('rate_event')
		.columns(['kind', 'email', 'created_at'])
		.execute();
	await db.schema
		.createIndex('rate_event_client_index')
		.on('rate_event')
		.columns(['kind', 'client', 'created_at'])
		.execute();

	for (const table of ['vehicle', 'revision', 'plan', 'run', 'check_signoff']) {
		await db.schema
			.alterTable(table)
			.addColumn('imported_by', 'text', (col) =>
				col.check(sql`imported_by is null or length(imported_by) <= 320`),
			)
			.execute();
	}
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const table of ['vehicle', 'revision', 'plan', 'run', 'check_signoff'])
		await db.schema.alterTable(table).dropColumn('imported_by').execute();
	await db.schema.dropTable('rate_event').execute();
	await db.schema.alterTable('User').dropColumn('sessionVersion').execute();
}
