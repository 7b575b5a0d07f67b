/**
 * A season's volume, invented: teams of 12 vehicles with 60 revisions each, 40 events, 1,500 runs
 * (a third with logger files of 3,000 samples) and 30 plans, to measure the product at the size a
 * busy team reaches (`--scale` shrinks or grows every count). Every name and number is made up;
 * the documents are the demo builds with their lengths, ratings and banks moved a little on each
 * revision, so each one is a valid build.
 *
 * CLI: `npm run demo:season -- --teams 10 --scale 1 [--no-files]` writes into DATABASE_URL (or the
 * embedded cluster `npm start` uses) and, unless `--no-files`, the logger files into the S3 store
 * the app is configured with. Each team's captain signs in as season-<n>@sagwise.test with the
 * demo password.
 */
import { randomUUID } from 'node:crypto';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { type Kysely, sql } from 'kysely';
import type { BuildDocument } from '../src/engine/types';
import { measurementColumns } from '../src/lib/schemas/run-measurements';
import { createDb } from '../src/lib/server/db/client';
import type { Database } from '../src/lib/server/db/schema';
import { storeLoggerSummary } from '../src/lib/server/db/runs';
import { hashPassword } from '../src/lib/server/passwords';
import type { Storage } from '../src/lib/server/storage';
import { DEFAULT_CLUSTER, ensureCluster } from './cluster';
import { DEMO_BUILDS } from './demo/builds';
import { migrateToLatest } from './migrator';
import { DEMO_PASSWORD } from './seed';

export interface SeasonOptions {
	/** Multiplies every count (1: the full season). */
	scale?: number;
	/** Which team of a batch this is (names and e-mail addresses). */
	index?: number;
	/** Where logger files go; none: samples only, no files. */
	storage?: Storage;
	/** The season's first day (yyyy-MM-dd). */
	startsOn?: string;
}

export interface SeasonCounts {
	teamId: string;
	vehicles: number;
	revisions: number;
	events: number;
	runs: number;
	loggerRuns: number;
	samples: number;
	plans: number;
}

/** The full season's counts, before scaling. */
export const SEASON = {
	vehicles: 12,
	revisionsPerVehicle: 60,
	events: 40,
	runs: 1500,
	loggerShare: 1 / 3,
	samplesPerLog: 3000,
	plans: 30,
} as const;

/** A small deterministic generator (mulberry32): the same season every time for the same index. */
function random(seed: number) {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

const BASES = Object.values(DEMO_BUILDS);
const VEHICLE_WORDS = ['Ember', 'Quarry', 'Tidewater', 'Bramble', 'Cinder', 'Gull', 'Lantern'];
const PLACES = ['North lot', 'Canal yard', 'Mill field', 'Ridge car park', 'Harbour apron'];

/** The next revision of a document: one part moved a little, within what the schema accepts. */
function nextDocument(doc: BuildDocument, rnd: () => number, n: number): BuildDocument {
	const d = structuredClone(doc);
	const pick = n % 3;
	if (pick === 0 && d.cables.length) {
		const c = d.cables[Math.floor(rnd() * d.cables.length)]!;
		c.lengthM = Math.round(Math.min(8, Math.max(0.2, c.lengthM * (0.9 + rnd() * 0.2))) * 100) / 100;
	} else if (pick === 1 && d.amplifiers.length) {
		const a = d.amplifiers[Math.floor(rnd() * d.amplifiers.length)]!;
		a.ratedPowerW = Math.round(Math.max(100, a.ratedPowerW * (0.95 + rnd() * 0.1)));
	} else if (d.banks.length) {
		const b = d.banks[Math.floor(rnd() * d.banks.length)]!;
		b.stateOfCharge =
			Math.round(Math.min(1, Math.max(0.5, b.stateOfCharge + (rnd() - 0.5) * 0.1)) * 100) / 100;
	}
	return d;
}

const day = (start: string, plus: number) =>
	new Date(Date.parse(`${start}T12:00:00Z`) + plus * 86_400_000).toISOString().slice(0, 10);

/** A logger trace of `n` samples: resting, a burp of a few seconds, recovery (20 samples a second). */
function trace(n: number, rnd: () => number) {
	const rest = 12.6 + rnd() * 0.6;
	const sag = 0.6 + rnd() * 1.2;
	const peakA = 300 + rnd() * 900;
	const t: number[] = [];
	const v: number[] = [];
	const a: number[] = [];
	const burpFrom = Math.floor(n * 0.2);
	const burpTo = Math.floor(n * 0.6);
	for (let i = 0; i < n; i++) {
		const inBurp = i >= burpFrom && i < burpTo;
		t.push(i / 20);
		a.push(Math.round((inBurp ? peakA * (0.97 + 0.06 * Math.sin(i)) : 12) * 10) / 10);
		v.push(Math.round((inBurp ? rest - sag : rest) * 1000 + Math.sin(i * 12.9898) * 3) / 1000);
	}
	return { t, v, a };
}

/** Writes one invented season's team. Commits per vehicle and per batch of runs, not in one go. */
export async function generateSeason(
	db: Kysely<Database>,
	opts: SeasonOptions = {},
): Promise<SeasonCounts> {
	const scale = opts.scale ?? 1;
	const index = opts.index ?? 1;
	const rnd = random(0x5ea5 + index * 7919);
	const count = (n: number) => Math.max(1, Math.round(n * scale));
	const startsOn = opts.startsOn ?? '2026-03-01';
	const passwordHash = await hashPassword(DEMO_PASSWORD);
	const stamp = randomUUID().slice(0, 8);

	const { teamId, userIds } = await db.transaction().execute(async (trx) => {
		const team = await trx
			.insertInto('team')
			.values({ name: `Season Test Team ${index} (${stamp})` })
			.returning('id')
			.executeTakeFirstOrThrow();
		const ids: string[] = [];
		for (const [r, role] of (['captain', 'member', 'member', 'viewer'] as const).entries()) {
			const user = await trx
				.insertInto('User')
				.values({
					id: randomUUID(),
					email: `season-${index}-${r}-${stamp}@sagwise.test`,
					name: `Season ${role} ${index}.${r}`,
					passwordHash,
					emailVerified: new Date(),
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			ids.push(user.id);
			await trx
				.insertInto('membership')
				.values({ team_id: team.id, user_id: user.id, role })
				.execute();
		}
		return { teamId: team.id, userIds: ids };
	});

	// Events every five days or so through the season.
	const eventCount = count(SEASON.events);
	const events: { id: string; on: string }[] = [];
	await db.transaction().execute(async (trx) => {
		for (let i = 0; i < eventCount; i++) {
			const on = day(startsOn, i * 5);
			const row = await trx
				.insertInto('event')
				.values({
					team_id: teamId,
					name: `Round ${i + 1}`,
					starts_on: on,
					ends_on: on,
					place: PLACES[i % PLACES.length]!,
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			events.push({ id: row.id, on });
		}
	});
	const seasonDays = Math.max(1, (eventCount - 1) * 5);

	// Vehicles, each with its revisions spread over the season.
	const vehicleCount = count(SEASON.vehicles);
	const perVehicle = count(SEASON.revisionsPerVehicle);
	const vehicles: { id: string; revisions: { id: string; at: Date }[] }[] = [];
	let revisions = 0;
	for (let v = 0; v < vehicleCount; v++) {
		const made = await db.transaction().execute(async (trx) => {
			const vehicle = await trx
				.insertInto('vehicle')
				.values({
					team_id: teamId,
					name: `${VEHICLE_WORDS[v % VEHICLE_WORDS.length]} ${Math.floor(v / VEHICLE_WORDS.length) + 1}`,
					description: 'Invented for the season benchmark',
					owner_id: userIds[v % 3]!,
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			const build = await trx
				.insertInto('build')
				.values({ vehicle_id: vehicle.id })
				.returning('id')
				.executeTakeFirstOrThrow();
			let doc = structuredClone(BASES[v % BASES.length]!);
			let parentId: string | null = null;
			const revs: { id: string; at: Date }[] = [];
			for (let n = 0; n < perVehicle; n++) {
				if (n > 0) doc = nextDocument(doc, rnd, n);
				const at = new Date(
					Date.parse(`${startsOn}T08:00:00Z`) -
						86_400_000 +
						(n / perVehicle) * seasonDays * 86_400_000,
				);
				const rev: { id: string } = await trx
					.insertInto('revision')
					.values({
						build_id: build.id,
						parent_id: parentId,
						number: n + 1,
						schema_version: doc.schemaVersion,
						document: JSON.stringify(doc),
						message: n === 0 ? 'Season start' : `Tuning step ${n}`,
						author_id: userIds[n % 3]!,
						created_at: at,
					})
					.returning('id')
					.executeTakeFirstOrThrow();
				parentId = rev.id;
				revs.push({ id: rev.id, at });
			}
			await trx
				.updateTable('build')
				.set({ head_revision_id: parentId })
				.where('id', '=', build.id)
				.execute();
			return { id: vehicle.id, revisions: revs, head: doc, headId: parentId! };
		});
		revisions += made.revisions.length;
		vehicles.push(made);
		// A few plans per vehicle, on its head.
	}

	// Plans, spread over the vehicles, each on its vehicle's head.
	const planCount = count(SEASON.plans);
	await db.transaction().execute(async (trx) => {
		for (let p = 0; p < planCount; p++) {
			const v = vehicles[p % vehicles.length]!;
			const head = v.revisions.at(-1)!;
			const document = (
				await trx
					.selectFrom('revision')
					.select('document')
					.where('id', '=', head.id)
					.executeTakeFirstOrThrow()
			).document as BuildDocument;
			const plan = await trx
				.insertInto('plan')
				.values({
					vehicle_id: v.id,
					name: `Idea ${p + 1}`,
					base_revision_id: head.id,
					schema_version: document.schemaVersion,
					document: JSON.stringify(nextDocument(document, rnd, p)),
					created_by: userIds[1]!,
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			await trx
				.insertInto('plan_part')
				.values({
					plan_id: plan.id,
					position: 0,
					item: 'Cable and lugs',
					quantity: 1,
					unit_price_minor: 4000 + p * 250,
				})
				.execute();
		}
	});

	// Runs: at events (most) and practice days, each linked to the revision in force.
	const runCount = count(SEASON.runs);
	const loggerEvery = Math.round(1 / SEASON.loggerShare);
	const samplesPerLog = Math.max(20, Math.round(SEASON.samplesPerLog * Math.min(1, scale * 10)));
	let loggerRuns = 0;
	let samples = 0;
	const BATCH = 50;
	for (let from = 0; from < runCount; from += BATCH) {
		await db.transaction().execute(async (trx) => {
			for (let r = from; r < Math.min(runCount, from + BATCH); r++) {
				const v = vehicles[r % vehicles.length]!;
				const event = r % 5 === 4 ? null : events[Math.floor(rnd() * events.length)]!;
				const onDay = event ? event.on : day(startsOn, Math.floor(rnd() * seasonDays));
				const ranAt = new Date(
					Date.parse(`${onDay}T10:00:00Z`) + Math.floor(rnd() * 8 * 3600) * 1000,
				);
				const inForce = [...v.revisions].reverse().find((x) => x.at <= ranAt) ?? null;
				const score = Math.round((138 + rnd() * 22) * 10) / 10;
				const run = await trx
					.insertInto('run')
					.values({
						vehicle_id: v.id,
						event_id: event?.id ?? null,
						revision_id: inForce?.id ?? null,
						ran_at: ranAt,
						ran_at_offset_min: 0,
						...measurementColumns({
							scoreDb: score,
							frequencyHz: 40 + Math.floor(rnd() * 20),
							restingV: Math.round((12.6 + rnd() * 0.8) * 100) / 100,
							minV: Math.round((10.8 + rnd() * 1.2) * 100) / 100,
							ambientC: Math.round(10 + rnd() * 20),
						}),
						author_id: userIds[1 + (r % 2)]!,
					})
					.returning('id')
					.executeTakeFirstOrThrow();
				if (r % loggerEvery !== 0) continue;
				const s = trace(samplesPerLog, rnd);
				await sql`insert into run_sample (run_id, seq, t_s, volts, amps)
					select ${run.id}::uuid, g.i - 1, t, v, a
					from unnest(${s.t}::float8[], ${s.v}::float8[], ${s.a}::float8[]) with ordinality as g(t, v, a, i)`.execute(
					trx,
				);
				await storeLoggerSummary(
					trx,
					run.id,
					s.t.map((tS, i) => ({ tS, volts: s.v[i]!, amps: s.a[i]! })),
				);
				loggerRuns++;
				samples += samplesPerLog;
				if (opts.storage) {
					const csv = `time_s,volts,amps\n${s.t.map((t, i) => `${t},${s.v[i]},${s.a[i]}`).join('\n')}\n`;
					const key = `teams/${teamId}/runs/${run.id}/logger-season.csv`;
					await opts.storage.put(key, new TextEncoder().encode(csv), 'text/csv');
					await trx
						.insertInto('stored_file')
						.values({
							team_id: teamId,
							run_id: run.id,
							kind: 'logger',
							object_key: key,
							file_name: 'logger.csv',
							content_type: 'text/csv',
							size_bytes: csv.length,
						})
						.execute();
				}
			}
		});
	}
	return {
		teamId,
		vehicles: vehicles.length,
		revisions,
		events: events.length,
		runs: runCount,
		loggerRuns,
		samples,
		plans: planCount,
	};
}

async function main() {
	const arg = (name: string) => {
		const i = process.argv.indexOf(`--${name}`);
		return i > 0 ? process.argv[i + 1] : undefined;
	};
	const scale = Number(arg('scale') ?? 1);
	const teams = Number(arg('teams') ?? 1);
	if (!(scale > 0 && scale <= 4) || !(Number.isInteger(teams) && teams >= 1 && teams <= 50)) {
		console.error('usage: npm run demo:season -- [--teams 1..50] [--scale 0..4] [--no-files]');
		process.exit(2);
	}
	const url =
		process.env.DATABASE_URL ??
		(await ensureCluster(DEFAULT_CLUSTER)).url(DEFAULT_CLUSTER.database);
	const db = createDb(url, 2);
	let storage: Storage | undefined;
	if (!process.argv.includes('--no-files')) {
		const { readConfig } = await import('../src/lib/server/config');
		const { createS3Storage } = await import('../src/lib/server/storage');
		storage = createS3Storage(readConfig().s3);
	}
	try {
		await migrateToLatest(db);
		for (let i = 1; i <= teams; i++) {
			const t0 = performance.now();
			const c = await generateSeason(db, { scale, index: i, storage });
			console.log(
				`team ${i}/${teams}: ${c.vehicles} vehicles, ${c.revisions} revisions, ${c.events} events, ${c.runs} runs (${c.loggerRuns} with ${c.samples} samples), ${c.plans} plans in ${((performance.now() - t0) / 1000).toFixed(1)} s`,
			);
		}
	} finally {
		await db.destroy();
	}
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
	main().catch((error: unknown) => {
		console.error(error);
		process.exit(1);
	});
}
