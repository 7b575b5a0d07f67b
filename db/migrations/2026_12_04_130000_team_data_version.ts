import { type Kysely, sql } from 'kysely';

/**
 * A team's data version: a counter the database bumps whenever anything the team page reads
 * changes (the team's settings, its vehicles, builds, revisions, plans, events, runs, checks and
 * sign-offs, its memberships, a member's name). Every instance can then keep what it worked out for
 * the team page under (team, version) and know, with the one membership query it makes anyway,
 * whether that is still current — with any number of instances writing.
 *
 * The triggers are deferred to commit, so a transaction takes the team row's lock last, after
 * every other lock it needs (no deadlock against a save holding its build's row), and bump the
 * counter at most once per team per transaction (an import of hundreds of rows writes it once).
 */
/** The tables whose rows belong to a team, directly or through a vehicle. */
const WATCHED = [
	'vehicle',
	'event',
	'check_item',
	'membership',
	'build',
	'revision',
	'plan',
	'run',
	'check_signoff',
];

export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('team')
		.addColumn('data_version', 'bigint', (col) => col.notNull().defaultTo(0))
		.execute();

	await sql`
		create function team_data_version_on_team() returns trigger language plpgsql as $$
		begin
			if new.data_version = old.data_version then
				new.data_version := old.data_version + 1;
			end if;
			return new;
		end $$`.execute(db);
	await sql`
		create trigger team_data_version before update on team
		for each row execute function team_data_version_on_team()`.execute(db);

	await sql`
		create function bump_team_data_version(p_team uuid) returns void language plpgsql as $$
		declare
			flag text := 'sagwise.bumped_' || replace(p_team::text, '-', '');
		begin
			if p_team is null or coalesce(current_setting(flag, true), '') = 'yes' then
				return;
			end if;
			perform set_config(flag, 'yes', true);
			update team set data_version = data_version + 1 where id = p_team;
		end $$`.execute(db);

	await sql`
		create function team_data_version_on_change() returns trigger language plpgsql as $$
		declare
			r record;
			vehicle uuid;
		begin
			if tg_op = 'DELETE' then r := old; else r := new; end if;
			if tg_table_name in ('vehicle', 'event', 'check_item', 'membership') then
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
	for (const table of WATCHED) {
		await sql`
			create constraint trigger ${sql.raw(`team_data_version_${table}`)}
			after insert or update or delete on ${sql.table(table)}
			deferrable initially deferred
			for each row execute function team_data_version_on_change()`.execute(db);
	}

	// A member's name or address shows in the team's activity.
	await sql`
		create function team_data_version_on_user() returns trigger language plpgsql as $$
		declare
			t uuid;
		begin
			if new.name is distinct from old.name or new.email is distinct from old.email then
				for t in select m.team_id from membership m where m.user_id = new.id loop
					perform bump_team_data_version(t);
				end loop;
			end if;
			return null;
		end $$`.execute(db);
	await sql`
		create constraint trigger team_data_version_user after update on "User"
		deferrable initially deferred
		for each row execute function team_data_version_on_user()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
	await sql`drop trigger team_data_version_user on "User"`.execute(db);
	await sql`drop function team_data_version_on_user()`.execute(db);
	for (const table of WATCHED)
		await sql`drop trigger ${sql.raw(`team_data_version_${table}`)} on ${sql.table(table)}`.execute(
			db,
		);
	await sql`drop function team_data_version_on_change()`.execute(db);
	await sql`drop function bump_team_data_version(uuid)`.execute(db);
	await sql`drop trigger team_data_version on team`.execute(db);
	await sql`drop function team_data_version_on_team()`.execute(db);
	await db.schema.alterTable('team').dropColumn('data_version').execute();
}
