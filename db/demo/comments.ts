import type { Kysely } from 'kysely';
import type { Database } from '../../src/lib/server/db/schema';

/**
 * Invented demo threads: what the demo team said beside its records. `author` and each mention
 * are indexes into the demo users; the subject is found by the seed (a vehicle's newest revision,
 * its first plan, its newest run, or the season's last event).
 */
export interface DemoComment {
	on: 'revision' | 'plan' | 'run' | 'event';
	vehicle: 'Pebble' | 'Marlin' | 'Old Oak' | null;
	author: number;
	/** Demo users it mentions (they get a notification). */
	mentions: number[];
	body: string;
	at: string;
}

export const DEMO_COMMENTS: DemoComment[] = [
	{
		on: 'revision',
		vehicle: 'Marlin',
		author: 0,
		mentions: [1],
		body: '@Demo Member why the jump to 1/0 on the rear feed here? The old run measured fine at the lanes.',
		at: '2026-09-14T19:20:00Z',
	},
	{
		on: 'revision',
		vehicle: 'Marlin',
		author: 1,
		mentions: [],
		body: 'The rear bank came back warm after three burps at the last meet. 1/0 takes about a third off that run’s drop.',
		at: '2026-09-14T20:05:00Z',
	},
	{
		on: 'plan',
		vehicle: 'Old Oak',
		author: 1,
		mentions: [0],
		body: '@Demo Captain the shelf price for the extra lithium module puts this plan over what is left this season. Wait for the autumn sale?',
		at: '2026-10-02T18:40:00Z',
	},
	{
		on: 'run',
		vehicle: 'Old Oak',
		author: 0,
		mentions: [],
		body: 'Logger shows the dip starts before the sweep peaks. Check the ground strap torque before the next run.',
		at: '2026-10-11T16:10:00Z',
	},
	{
		on: 'event',
		vehicle: null,
		author: 1,
		mentions: [0],
		body: 'Trailer leaves at 6:30. @Demo Captain bring the spare fuse kit and the clamp meter.',
		at: '2026-10-20T08:00:00Z',
	},
];

/** Writes the demo threads and the notifications their mentions made (already mailed, not read). */
export async function seedDemoComments(
	trx: Kysely<Database>,
	teamId: string,
	users: Array<{ id: string; name: string }>,
): Promise<void> {
	const vehicleId = async (name: string) =>
		(
			await trx
				.selectFrom('vehicle')
				.select('id')
				.where('team_id', '=', teamId)
				.where('name', '=', name)
				.executeTakeFirstOrThrow()
		).id;
	for (const c of DEMO_COMMENTS) {
		const vehicle = c.vehicle ? await vehicleId(c.vehicle) : null;
		const subject =
			c.on === 'revision'
				? {
						revision_id: (
							await trx
								.selectFrom('build')
								.select('head_revision_id')
								.where('vehicle_id', '=', vehicle!)
								.executeTakeFirstOrThrow()
						).head_revision_id!,
					}
				: c.on === 'plan'
					? {
							plan_id: (
								await trx
									.selectFrom('plan')
									.select('id')
									.where('vehicle_id', '=', vehicle!)
									.orderBy('created_at')
									.executeTakeFirstOrThrow()
							).id,
						}
					: c.on === 'run'
						? {
								run_id: (
									await trx
										.selectFrom('run')
										.select('id')
										.where('vehicle_id', '=', vehicle!)
										.orderBy('ran_at', 'desc')
										.executeTakeFirstOrThrow()
								).id,
							}
						: {
								event_id: (
									await trx
										.selectFrom('event')
										.select('id')
										.where('team_id', '=', teamId)
										.orderBy('starts_on', 'desc')
										.executeTakeFirstOrThrow()
								).id,
							};
		const row = await trx
			.insertInto('comment')
			.values({
				team_id: teamId,
				...subject,
				author_id: users[c.author]!.id,
				author_name: users[c.author]!.name,
				body: c.body,
				created_at: c.at,
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		for (const m of c.mentions)
			await trx
				.insertInto('notification')
				.values({
					user_id: users[m]!.id,
					team_id: teamId,
					comment_id: row.id,
					created_at: c.at,
					mailed_at: c.at,
				})
				.execute();
	}
}
