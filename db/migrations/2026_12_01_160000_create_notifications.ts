import { type Kysely, sql } from 'kysely';

/** Reminder settings per team, and a ledger of sent notifications so that jobs never send twice. */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('team')
		.addColumn('reminder_days', 'integer', (col) =>
			col
				.notNull()
				.defaultTo(7)
				.check(sql`reminder_days between 0 and 60`),
		)
		.execute();
	await db.schema.alterTable('team').addColumn('last_digest_at', 'timestamptz').execute();
	await db.schema
		.createTable('notification_sent')
		.addColumn('kind', 'text', (col) =>
			col.notNull().check(sql`kind in ('event_reminder', 'revision_digest')`),
		)
		.addColumn('subject_key', 'text', (col) => col.notNull())
		.addColumn('user_id', 'text', (col) => col.notNull().references('User.id').onDelete('cascade'))
		.addColumn('sent_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addPrimaryKeyConstraint('notification_sent_pk', ['kind', 'subject_key', 'user_id'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('notification_sent').execute();
	await db.schema.alterTable('team').dropColumn('last_digest_at').execute();
	await db.schema.alterTable('team').dropColumn('reminder_days').execute();
}
