import { type Kysely, sql } from 'kysely';

/**
 * Comment threads beside a revision, a run, a plan and an event; the notifications a mention
 * sends (read in the app, mailed at once or in a daily digest, each member's choice); whether a
 * team lets its viewers comment. A comment names exactly one subject, each a real foreign key, so
 * deleting the subject deletes its thread. Comments show in the team's activity, so they bump the
 * team's data version like the other tables the team page reads.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('team')
		.addColumn('viewers_may_comment', 'boolean', (col) => col.notNull().defaultTo(false))
		.execute();
	await db.schema
		.alterTable('User')
		.addColumn('mention_mail', 'text', (col) =>
			col
				.notNull()
				.defaultTo('immediate')
				.check(sql`mention_mail in ('immediate', 'daily', 'off')`),
		)
		.execute();
	await db.schema
		.createTable('comment')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('team_id', 'uuid', (col) => col.notNull().references('team.id').onDelete('cascade'))
		.addColumn('revision_id', 'uuid', (col) => col.references('revision.id').onDelete('cascade'))
		.addColumn('run_id', 'uuid', (col) => col.references('run.id').onDelete('cascade'))
		.addColumn('plan_id', 'uuid', (col) => col.references('plan.id').onDelete('cascade'))
		.addColumn('event_id', 'uuid', (col) => col.references('event.id').onDelete('cascade'))
		.addColumn('author_id', 'text', (col) => col.references('User.id').onDelete('set null'))
		/** The author as the team knew them when they wrote (kept if the account goes). */
		.addColumn('author_name', 'text', (col) => col.notNull().defaultTo(''))
		/** The author as a restored backup recorded them (their address; never a live account here). */
		.addColumn('imported_by', 'text')
		.addColumn('body', 'text', (col) =>
			col.notNull().check(sql`char_length(body) between 1 and 4000`),
		)
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addColumn('edited_at', 'timestamptz')
		.addCheckConstraint(
			'comment_one_subject',
			sql`num_nonnulls(revision_id, run_id, plan_id, event_id) = 1`,
		)
		.execute();
	for (const subject of ['revision_id', 'run_id', 'plan_id', 'event_id'])
		await sql`create index ${sql.raw(`comment_${subject}_idx`)} on comment (${sql.raw(subject)}, created_at) where ${sql.raw(subject)} is not null`.execute(
			db,
		);
	// For the limit on how fast one person writes.
	await db.schema
		.createIndex('comment_author_idx')
		.on('comment')
		.columns(['author_id', 'created_at'])
		.execute();
	await db.schema
		.createIndex('comment_team_idx')
		.on('comment')
		.columns(['team_id', 'created_at'])
		.execute();

	await db.schema
		.createTable('notification')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('user_id', 'text', (col) => col.notNull().references('User.id').onDelete('cascade'))
		.addColumn('team_id', 'uuid', (col) => col.notNull().references('team.id').onDelete('cascade'))
		.addColumn('comment_id', 'uuid', (col) =>
			col.notNull().references('comment.id').onDelete('cascade'),
		)
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addColumn('read_at', 'timestamptz')
		/** When its mail went out (at once or in a digest); set in the same transaction as the send. */
		.addColumn('mailed_at', 'timestamptz')
		.addUniqueConstraint('notification_once', ['user_id', 'comment_id'])
		.execute();
	await db.schema
		.createIndex('notification_user_idx')
		.on('notification')
		.columns(['user_id', 'created_at'])
		.execute();
	await sql`create index notification_unmailed_idx on notification (user_id) where mailed_at is null`.execute(
		db,
	);

	await sql`alter table notification_sent drop constraint notification_sent_kind_check`.execute(db);
	await sql`alter table notification_sent add constraint notification_sent_kind_check
		check (kind in ('event_reminder', 'revision_digest', 'mention_digest'))`.execute(db);

	await sql`
		create or replace function team_data_version_on_change() returns trigger language plpgsql as $$
		declare
			r record;
			vehicle uuid;
		begin
			if tg_op = 'DELETE' then r := old; else r := new; end if;
			if tg_table_name in ('vehicle', 'event', 'check_item', 'membership', 'comment') then
				perform bump_team_data_version(r.team_id);
				return null;
			end if;
			if tg_table_name = 'build' then
				vehicle := r.vehicle_id;
			elsif tg_table_name = 'revision' then
				select b.vehicle_id into vehicle from build b where b.id = r.build_id;
			else
				vehicle := r.vehicle_id;
			end if;
			perform bump_team_data_version((select v.team_id from vehicle v where v.id = vehicle));
			return null;
		end $$`.execute(db);
	await sql`
		create constraint trigger team_data_version_comment
		after insert or update or delete on comment
		deferrable initially deferred
		for each row execute function team_data_version_on_change()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
	await sql`drop trigger team_data_version_comment on comment`.execute(db);
	await db.schema.dropTable('notification').execute();
	await db.schema.dropTable('comment').execute();
	await sql`delete from notification_sent where kind = 'mention_digest'`.execute(db);
	await sql`alter table notification_sent drop constraint notification_sent_kind_check`.execute(db);
	await sql`alter table notification_sent add constraint notification_sent_kind_check
		check (kind in ('event_reminder', 'revision_digest'))`.execute(db);
	await db.schema.alterTable('User').dropColumn('mention_mail').execute();
	await db.schema.alterTable('team').dropColumn('viewers_may_comment').execute();
}
