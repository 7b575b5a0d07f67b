import { type Kysely, sql } from 'kysely';

/**
 * A purchase's receipt photo, stored like a run's photos (checked by content, without its
 * metadata) and removed with the purchase. A receipt names its purchase; a run's files name their
 * run.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('stored_file')
		.addColumn('purchase_id', 'uuid', (col) => col.references('purchase.id').onDelete('cascade'))
		.execute();
	await sql`alter table stored_file drop constraint stored_file_kind_check`.execute(db);
	await sql`alter table stored_file add constraint stored_file_kind_check
		check (kind in ('logger', 'photo', 'thumbnail', 'receipt'))`.execute(db);
	await sql`alter table stored_file add constraint stored_file_receipt_owner
		check ((kind = 'receipt') = (purchase_id is not null))`.execute(db);
	// One receipt per purchase.
	await sql`create unique index stored_file_purchase_idx on stored_file (purchase_id) where purchase_id is not null`.execute(
		db,
	);
}

export async function down(db: Kysely<any>): Promise<void> {
	await sql`delete from stored_file where kind = 'receipt'`.execute(db);
	await sql`drop index stored_file_purchase_idx`.execute(db);
	await sql`alter table stored_file drop constraint stored_file_receipt_owner`.execute(db);
	await sql`alter table stored_file drop constraint stored_file_kind_check`.execute(db);
	await sql`alter table stored_file add constraint stored_file_kind_check
		check (kind in ('logger', 'photo', 'thumbnail'))`.execute(db);
	await db.schema.alterTable('stored_file').dropColumn('purchase_id').execute();
}
