import { type Kysely, sql } from 'kysely';

/**
 * Accounts (the tables the Auth.js Kysely adapter expects, with its quoted camelCase names),
 * memberships with roles, invitations, password resets and sign-in attempts for rate limiting.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('User')
		.addColumn('id', 'text', (col) => col.primaryKey())
		.addColumn('name', 'text')
		.addColumn('email', 'text', (col) =>
			col
				.notNull()
				.unique()
				.check(sql`email = lower(email) and position('@' in email) > 1`),
		)
		.addColumn('emailVerified', 'timestamptz')
		.addColumn('image', 'text')
		.addColumn('passwordHash', 'text')
		.addColumn('unitSystem', 'text', (col) =>
			col
				.notNull()
				.defaultTo('imperial')
				.check(sql`"unitSystem" in ('imperial', 'metric')`),
		)
		.addColumn('createdAt', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();

	await db.schema
		.createTable('Account')
		.addColumn('id', 'text', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()::text`))
		.addColumn('userId', 'text', (col) => col.notNull().references('User.id').onDelete('cascade'))
		.addColumn('type', 'text', (col) => col.notNull())
		.addColumn('provider', 'text', (col) => col.notNull())
		.addColumn('providerAccountId', 'text', (col) => col.notNull())
		.addColumn('refresh_token', 'text')
		.addColumn('access_token', 'text')
		.addColumn('expires_at', 'bigint')
		.addColumn('token_type', 'text')
		.addColumn('scope', 'text')
		.addColumn('id_token', 'text')
		.addColumn('session_state', 'text')
		.addUniqueConstraint('account_provider_unique', ['provider', 'providerAccountId'])
		.execute();
	await db.schema.createIndex('account_user_id_index').on('Account').column('userId').execute();

	await db.schema
		.createTable('Session')
		.addColumn('id', 'text', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()::text`))
		.addColumn('sessionToken', 'text', (col) => col.notNull().unique())
		.addColumn('userId', 'text', (col) => col.notNull().references('User.id').onDelete('cascade'))
		.addColumn('expires', 'timestamptz', (col) => col.notNull())
		.execute();

	await db.schema
		.createTable('VerificationToken')
		.addColumn('identifier', 'text', (col) => col.notNull())
		.addColumn('token', 'text', (col) => col.notNull().unique())
		.addColumn('expires', 'timestamptz', (col) => col.notNull())
		.addPrimaryKeyConstraint('verification_token_pk', ['identifier', 'token'])
		.execute();

	await db.schema
		.createTable('membership')
		.addColumn('team_id', 'uuid', (col) => col.notNull().references('team.id').onDelete('cascade'))
		.addColumn('user_id', 'text', (col) => col.notNull().references('User.id').onDelete('cascade'))
		.addColumn('role', 'text', (col) =>
			col.notNull().check(sql`role in ('captain', 'member', 'viewer')`),
		)
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addPrimaryKeyConstraint('membership_pk', ['team_id', 'user_id'])
		.execute();
	await db.schema
		.createIndex('membership_user_id_index')
		.on('membership')
		.column('user_id')
		.execute();

	await db.schema
		.createTable('invitation')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('team_id', 'uuid', (col) => col.notNull().references('team.id').onDelete('cascade'))
		.addColumn('email', 'text', (col) => col.notNull().check(sql`email = lower(email)`))
		.addColumn('role', 'text', (col) =>
			col.notNull().check(sql`role in ('captain', 'member', 'viewer')`),
		)
		.addColumn('token_hash', 'text', (col) => col.notNull().unique())
		.addColumn('invited_by', 'text', (col) => col.references('User.id').onDelete('set null'))
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addColumn('last_sent_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addColumn('expires_at', 'timestamptz', (col) => col.notNull())
		.addColumn('accepted_at', 'timestamptz')
		.addColumn('accepted_by', 'text', (col) => col.references('User.id').onDelete('set null'))
		.addColumn('revoked_at', 'timestamptz')
		.addCheckConstraint('invitation_one_outcome', sql`accepted_at is null or revoked_at is null`)
		.execute();
	// One open invitation per address and team.
	await sql`create unique index invitation_open_unique on invitation (team_id, email) where accepted_at is null and revoked_at is null`.execute(
		db,
	);

	await db.schema
		.createTable('password_reset')
		.addColumn('id', 'uuid', (col) => col.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('user_id', 'text', (col) => col.notNull().references('User.id').onDelete('cascade'))
		.addColumn('token_hash', 'text', (col) => col.notNull().unique())
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.addColumn('expires_at', 'timestamptz', (col) => col.notNull())
		.addColumn('used_at', 'timestamptz')
		.execute();

	await db.schema
		.createTable('sign_in_attempt')
		.addColumn('id', 'bigserial', (col) => col.primaryKey())
		.addColumn('email', 'text', (col) => col.notNull())
		.addColumn('client', 'text', (col) => col.notNull())
		.addColumn('succeeded', 'boolean', (col) => col.notNull())
		.addColumn('created_at', 'timestamptz', (col) => col.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('sign_in_attempt_email_index')
		.on('sign_in_attempt')
		.columns(['email', 'created_at'])
		.execute();
	await db.schema
		.createIndex('sign_in_attempt_client_index')
		.on('sign_in_attempt')
		.columns(['client', 'created_at'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const table of [
		'sign_in_attempt',
		'password_reset',
		'invitation',
		'membership',
		'VerificationToken',
		'Session',
		'Account',
		'User',
	]) {
		await db.schema.dropTable(table).execute();
	}
}
