import { type Kysely, sql } from 'kysely';
import { CHECK_TITLES } from '@/engine';
import type { Database } from '@/lib/server/db/schema';
import { runVoltage } from '@/lib/run-figures';
import { authorLabel, recentComments } from '@/lib/server/db/comments';

type Db = Kysely<Database>;

/** One thing that happened in the team, for its activity list. */
export interface ActivityEntry {
	kind: 'revision' | 'run' | 'signoff' | 'install' | 'comment';
	at: Date;
	who: string | null;
	/** The vehicle it is about; none for a comment on an event. */
	vehicleId: string | null;
	vehicleName: string | null;
	/** What happened, in words ("r4: Second alternator", "148.3 dB at 11.70 V"). */
	text: string;
}

const who = (name: string | null, email: string | null, imported: string | null) =>
	name ?? email ?? (imported ? `${imported} (imported)` : null);

/**
 * The team's recent activity, newest first: revisions with their messages, runs, sign-offs and
 * waivers, plan installs and comments, each with who did it. Each kind is read newest first up to `limit`
 * and the lists merged.
 */
export async function findRecentActivity(
	db: Db,
	teamId: string,
	limit = 12,
): Promise<ActivityEntry[]> {
	const [revisions, runs, signoffs, installs, comments] = await Promise.all([
		db
			.selectFrom('revision as r')
			.innerJoin('build as b', 'b.id', 'r.build_id')
			.innerJoin('vehicle as v', 'v.id', 'b.vehicle_id')
			.leftJoin('User as u', 'u.id', 'r.author_id')
			.select([
				'r.number',
				'r.message',
				'r.created_at',
				'r.imported_by',
				'v.id as vehicle_id',
				'v.name as vehicle_name',
				'u.name',
				'u.email',
			])
			.where('v.team_id', '=', teamId)
			// A plan install also saves a revision; it is listed once, as the install.
			.where(({ not, exists, selectFrom }) =>
				not(
					exists(
						selectFrom('plan as p').select('p.id').whereRef('p.installed_revision_id', '=', 'r.id'),
					),
				),
			)
			.orderBy('r.created_at', 'desc')
			.limit(limit)
			.execute(),
		db
			.selectFrom('run as r')
			.innerJoin('vehicle as v', 'v.id', 'r.vehicle_id')
			.leftJoin('User as u', 'u.id', 'r.author_id')
			.leftJoin('event as e', 'e.id', 'r.event_id')
			.select([
				'r.created_at',
				'r.ran_at',
				'r.score_db',
				'r.min_v',
				'r.logger_min_v',
				'v.id as vehicle_id',
				'v.name as vehicle_name',
				'e.name as event_name',
				'u.name',
				'u.email',
			])
			.where('v.team_id', '=', teamId)
			.orderBy('r.created_at', 'desc')
			.limit(limit)
			.execute(),
		db
			.selectFrom('check_signoff as s')
			.innerJoin('vehicle as v', 'v.id', 's.vehicle_id')
			.innerJoin('event as e', 'e.id', 's.event_id')
			.leftJoin('User as u', 'u.id', 's.signed_by')
			.leftJoin('check_item as ci', (j) =>
				j.on(sql<string>`'manual:' || ci.id::text`, '=', sql.ref('s.item_key')),
			)
			.select([
				's.item_key',
				's.signed_at',
				's.waived',
				's.imported_by',
				'ci.label as manual_label',
				'v.id as vehicle_id',
				'v.name as vehicle_name',
				'e.name as event_name',
				'u.name',
				'u.email',
			])
			.where('v.team_id', '=', teamId)
			.orderBy('s.signed_at', 'desc')
			.limit(limit)
			.execute(),
		db
			.selectFrom('plan as p')
			.innerJoin('vehicle as v', 'v.id', 'p.vehicle_id')
			.innerJoin('revision as r', 'r.id', 'p.installed_revision_id')
			.leftJoin('User as u', 'u.id', 'r.author_id')
			.select([
				'p.name as plan_name',
				'p.installed_at',
				'r.number',
				'r.created_at',
				'r.imported_by',
				'v.id as vehicle_id',
				'v.name as vehicle_name',
				'u.name',
				'u.email',
			])
			.where('v.team_id', '=', teamId)
			.orderBy('r.created_at', 'desc')
			.limit(limit)
			.execute(),
		recentComments(db, teamId, limit),
	]);
	const entries: ActivityEntry[] = [
		...revisions.map((r) => ({
			kind: 'revision' as const,
			at: r.created_at,
			who: who(r.name, r.email, r.imported_by),
			vehicleId: r.vehicle_id,
			vehicleName: r.vehicle_name,
			text: `saved r${r.number}: ${r.message}`,
		})),
		...runs.map((r) => ({
			kind: 'run' as const,
			at: r.created_at,
			who: who(r.name, r.email, null),
			vehicleId: r.vehicle_id,
			vehicleName: r.vehicle_name,
			text: `logged a run${r.event_name ? ` at ${r.event_name}` : ''}${r.score_db !== null ? `: ${r.score_db.toFixed(1)} dB` : ''}${minOf(r) !== null ? ` at ${minOf(r)!.toFixed(2)} V` : ''}`,
		})),
		...signoffs.map((s) => {
			const item = s.manual_label ?? CHECK_TITLES[s.item_key] ?? s.item_key;
			return {
				kind: 'signoff' as const,
				at: s.signed_at,
				who: who(s.name, s.email, s.imported_by),
				vehicleId: s.vehicle_id,
				vehicleName: s.vehicle_name,
				text: `${s.waived ? 'waived' : 'signed off'} “${item}” for ${s.event_name}`,
			};
		}),
		...installs.map((p) => ({
			kind: 'install' as const,
			at: p.installed_at ?? p.created_at,
			who: who(p.name, p.email, p.imported_by),
			vehicleId: p.vehicle_id,
			vehicleName: p.vehicle_name,
			text: `installed the plan “${p.plan_name}” as r${p.number}`,
		})),
		...comments.map((c) => ({
			kind: 'comment' as const,
			at: c.created_at,
			who: authorLabel(c),
			vehicleId: c.place.vehicleId,
			vehicleName: c.place.vehicleName,
			text: `commented on ${c.place.label}: “${c.body.length > 80 ? `${c.body.slice(0, 80)}…` : c.body}”`,
		})),
	];
	return entries.sort((a, b) => b.at.getTime() - a.at.getTime()).slice(0, limit);
}

/** A run's minimum voltage as every view shows it: the logger file's where there is one. */
function minOf(r: { min_v: number | null; logger_min_v: number | null }): number | null {
	return runVoltage(
		{
			minV: r.min_v,
			restingV: null,
			logger: r.logger_min_v === null ? null : { minV: r.logger_min_v, restingV: null },
		},
		'minV',
	).value;
}
