import { type Kysely, sql } from 'kysely';

/**
 * Records a team can trust: a run keeps the UTC offset it was entered with and an idempotency key
 * from the device that logged it (a retry of the same write finds the first run instead of making a
 * second); the logger's own resting and minimum voltage are kept beside the typed ones so the two
 * can be compared; a sign-off of a failing computed check is a waiver, marked as one.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('run')
		.addColumn('ran_at_offset_min', 'smallint', (col) =>
			col.check(sql`ran_at_offset_min between -900 and 900`),
		)
		.addColumn('client_key', 'uuid')
		.addColumn('logger_resting_v', 'double precision')
		.addColumn('logger_min_v', 'double precision')
		.execute();
	await db.schema
		.createIndex('run_client_key_index')
		.on('run')
		.columns(['vehicle_id', 'client_key'])
		.unique()
		.where(sql.ref('client_key'), 'is not', null)
		.execute();
	await sql`
		with s as (
			select run_id, min(amps) lo, max(amps) hi, min(volts) vmin from run_sample group by run_id
		), st as (
			select rs.run_id, min(rs.t_s) t0 from run_sample rs join s using (run_id)
			where rs.amps >= s.lo + 0.5 * (s.hi - s.lo) group by rs.run_id
		), rest as (
			select rs.run_id, avg(rs.volts) v from run_sample rs join st using (run_id)
			where rs.t_s < st.t0 group by rs.run_id
		)
		update run set logger_min_v = s.vmin, logger_resting_v = rest.v
		from s left join rest using (run_id) where run.id = s.run_id`.execute(db);

	await db.schema
		.alterTable('check_signoff')
		.addColumn('waived', 'boolean', (col) => col.notNull().defaultTo(false))
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('check_signoff').dropColumn('waived').execute();
	await db.schema.dropIndex('run_client_key_index').execute();
	await db.schema
		.alterTable('run')
		.dropColumn('ran_at_offset_min')
		.dropColumn('client_key')
		.dropColumn('logger_resting_v')
		.dropColumn('logger_min_v')
		.execute();
}
