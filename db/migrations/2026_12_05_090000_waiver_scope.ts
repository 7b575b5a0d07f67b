import type { Kysely } from 'kysely';

/**
 * A waiver belongs to what it waived: the revision it was given on, and the figure the item
 * failed with then (the worst drop, say) or the findings it named. A later revision that makes the
 * item worse re-opens it.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('check_signoff')
		.addColumn('revision_id', 'uuid', (col) => col.references('revision.id').onDelete('set null'))
		.addColumn('waived_value', 'double precision')
		.addColumn('waived_reasons', 'jsonb')
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('check_signoff')
		.dropColumn('revision_id')
		.dropColumn('waived_value')
		.dropColumn('waived_reasons')
		.execute();
}
