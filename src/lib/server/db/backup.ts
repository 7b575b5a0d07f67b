import type { Kysely } from 'kysely';
import type { Database, Role } from '@/lib/server/db/schema';
import { measurementColumns } from '@/lib/schemas/run-measurements';
import { sampleAt, type TeamBackupContent } from '@/lib/schemas/team-backup';
import type { ImportSummary } from '@/lib/schemas/teams';
import { storeLoggerSummary } from '@/lib/server/db/runs';

type Db = Kysely<Database>;

/**
 * What a streamed backup reads up front: the team and its small tables, each vehicle's revision
 * numbers (not documents), the runs' rows (not samples) and the sign-offs. Documents, samples and
 * files are read a vehicle or a batch of runs at a time (below), so memory holds one slice.
 */
export async function readTeamOutline(db: Db, teamId: string) {
	const team = await db
		.selectFrom('team')
		.selectAll()
		.where('id', '=', teamId)
		.executeTakeFirstOrThrow();
	const [members, items, vehicles, events] = await Promise.all([
		db
			.selectFrom('membership as m')
			.innerJoin('User as u', 'u.id', 'm.user_id')
			.select(['u.email', 'u.name', 'm.role'])
			.where('m.team_id', '=', teamId)
			.orderBy('u.email')
			.execute(),
		db
			.selectFrom('check_item')
			.selectAll()
			.where('team_id', '=', teamId)
			.orderBy('created_at')
			.orderBy('label')
			.orderBy('id')
			.execute(),
		db
			.selectFrom('vehicle as v')
			.innerJoin('build as b', 'b.vehicle_id', 'v.id')
			.selectAll('v')
			.select(['b.id as build_id', 'b.head_revision_id'])
			.where('v.team_id', '=', teamId)
			.orderBy('v.created_at')
			.orderBy('v.name')
			.orderBy('v.id')
			.execute(),
		db
			.selectFrom('event')
			.selectAll()
			.where('team_id', '=', teamId)
			.orderBy('starts_on')
			.orderBy('name')
			.orderBy('created_at')
			.orderBy('id')
			.execute(),
	]);
	const buildIds = vehicles.map((v) => v.build_id);
	const vehicleIds = vehicles.map((v) => v.id);
	const [revisionNumbers, runs, signoffs] = await Promise.all([
		buildIds.length
			? db
					.selectFrom('revision')
					.select(['id', 'number', 'author_id'])
					.where('build_id', 'in', buildIds)
					.execute()
			: [],
		vehicleIds.length
			? db
					.selectFrom('run')
					.selectAll()
					.where('vehicle_id', 'in', vehicleIds)
					.orderBy('ran_at')
					.orderBy('created_at')
					.orderBy('id')
					.execute()
			: [],
		events.length
			? db
					.selectFrom('check_signoff')
					.selectAll()
					.where(
						'event_id',
						'in',
						events.map((e) => e.id),
					)
					.orderBy('signed_at')
					.orderBy('item_key')
					.execute()
			: [],
	]);
	return { team, members, items, vehicles, events, revisionNumbers, runs, signoffs };
}

/** The e-mail addresses of the accounts named by `ids` (authors, owners, signers). */
export async function emailsOf(db: Db, ids: string[]): Promise<Map<string, string>> {
	const unique = [...new Set(ids)];
	if (unique.length === 0) return new Map();
	const rows = await db
		.selectFrom('User')
		.select(['id', 'email'])
		.where('id', 'in', unique)
		.execute();
	return new Map(rows.map((u) => [u.id, u.email]));
}

/** One vehicle's revisions with their documents, oldest first. */
export function readBuildRevisions(db: Db, buildId: string) {
	return db
		.selectFrom('revision')
		.selectAll()
		.where('build_id', '=', buildId)
		.orderBy('number')
		.execute();
}

/** One vehicle's plans with their documents and parts. */
export async function readVehiclePlans(db: Db, vehicleId: string) {
	const plans = await db
		.selectFrom('plan')
		.selectAll()
		.where('vehicle_id', '=', vehicleId)
		.orderBy('created_at')
		.orderBy('name')
		.orderBy('id')
		.execute();
	const parts = plans.length
		? await db
				.selectFrom('plan_part')
				.selectAll()
				.where(
					'plan_id',
					'in',
					plans.map((p) => p.id),
				)
				.orderBy('position')
				.execute()
		: [];
	return { plans, partsByPlan: groupBy(parts, (x) => x.plan_id) };
}

/** The samples and stored files of a batch of runs. */
export async function readRunsDetail(db: Db, runIds: string[]) {
	if (runIds.length === 0) return { samplesByRun: new Map(), filesByRun: new Map() };
	const [samples, files] = await Promise.all([
		db
			.selectFrom('run_sample')
			.select(['run_id', 't_s', 'volts', 'amps'])
			.where('run_id', 'in', runIds)
			.orderBy('run_id')
			.orderBy('seq')
			.execute(),
		db
			.selectFrom('stored_file')
			.selectAll()
			.where('run_id', 'in', runIds)
			.orderBy('created_at')
			.orderBy('kind')
			.orderBy('object_key')
			.execute(),
	]);
	return {
		samplesByRun: groupBy(samples, (x) => x.run_id),
		filesByRun: groupBy(files, (f) => f.run_id!),
	};
}

function groupBy<T>(rows: T[], key: (row: T) => string): Map<string, T[]> {
	const out = new Map<string, T[]>();
	for (const row of rows) {
		const k = key(row);
		const list = out.get(k);
		if (list) list.push(row);
		else out.set(k, [row]);
	}
	return out;
}

/** A file of a backup, checked by its content and ready to store. */
export interface ImportedFile {
	kind: 'logger' | 'photo' | 'thumbnail';
	fileName: string;
	contentType: string;
	bytes: Uint8Array;
	createdAt: string;
	/** Its index among the run's files in the backup. */
	sourceIndex: number;
	/** The photo this thumbnail belongs to, by its index in the run's files (thumbnails only). */
	pairedWith: number | null;
}

/** Puts one file in storage and answers its object key; `photoBase` pairs a run's thumbnails with their photos. */
export type StoreImportedFile = (
	teamId: string,
	runId: string,
	file: ImportedFile,
	photoBase: Map<number, string>,
) => Promise<string>;

/**
 * Writes a parsed backup as a new team, in one transaction. The importer becomes captain and the
 * only member; everyone else the file names becomes a pending invitation. Authors, owners and
 * sign-offs are kept as recorded in the file (`imported_by`), never mapped to a live account.
 */
export async function insertTeamFromBackup(
	db: Db,
	t: TeamBackupContent,
	p: {
		importer: { id: string; email: string };
		name: string | undefined;
		files: ImportedFile[][];
		invitationTokenHash: () => string;
	},
	storeFile: StoreImportedFile,
): Promise<Omit<ImportSummary, 'photosCleaned'>> {
	const importerEmail = p.importer.email.toLowerCase();
	const roles = new Map<string, Role>();
	for (const m of t.members) roles.set(m.email.toLowerCase(), m.role);
	roles.delete(importerEmail);
	const recorded = (email: string | null) => (email ? email.toLowerCase() : null);
	return db.transaction().execute(async (trx) => {
		const team = await trx
			.insertInto('team')
			.values({
				name: p.name ?? t.name,
				reminder_days: t.reminderDays,
				fuse_distance_m: t.fuseDistanceM,
				currency: t.currency,
				created_at: t.createdAt,
			})
			.returning(['id', 'name'])
			.executeTakeFirstOrThrow();
		await trx
			.insertInto('membership')
			.values({ team_id: team.id, user_id: p.importer.id, role: 'captain' })
			.execute();
		for (const [email, role] of roles) {
			await trx
				.insertInto('invitation')
				.values({
					team_id: team.id,
					email,
					role,
					token_hash: p.invitationTokenHash(),
					invited_by: p.importer.id,
					expires_at: new Date(Date.now() + 7 * 86_400_000),
				})
				.execute();
		}

		const itemIds = new Map<string, string>();
		for (const it of t.checkItems) {
			const row = await trx
				.insertInto('check_item')
				.values({ team_id: team.id, label: it.label, created_at: it.createdAt })
				.returning('id')
				.executeTakeFirstOrThrow();
			itemIds.set(`manual:${it.key}`, `manual:${row.id}`);
		}

		const vehicleIds = new Map<string, string>();
		const revisionIds = new Map<string, string>(); // `${vehicleKey}#${number}` → id
		let revisions = 0;
		let plans = 0;
		for (const v of t.vehicles) {
			const vehicle = await trx
				.insertInto('vehicle')
				.values({
					team_id: team.id,
					name: v.name,
					description: v.description,
					competition_class: v.competitionClass,
					notes: v.notes,
					archived_at: v.archivedAt,
					owner_id: null,
					imported_by: recorded(v.ownerEmail),
					created_at: v.createdAt,
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			vehicleIds.set(v.key, vehicle.id);
			const build = await trx
				.insertInto('build')
				.values({ vehicle_id: vehicle.id })
				.returning('id')
				.executeTakeFirstOrThrow();
			const rev = (n: number | null) => (n === null ? null : revisionIds.get(`${v.key}#${n}`)!);
			// Parents and restore sources always have lower numbers, so number order resolves them.
			for (const r of [...v.revisions].sort((a, b) => a.number - b.number)) {
				const row = await trx
					.insertInto('revision')
					.values({
						build_id: build.id,
						parent_id: rev(r.parent),
						number: r.number,
						schema_version: r.document.schemaVersion,
						document: JSON.stringify(r.document),
						message: r.message,
						author_id: null,
						imported_by: recorded(r.authorEmail),
						restored_from_id: rev(r.restoredFrom),
						created_at: r.createdAt,
					})
					.returning('id')
					.executeTakeFirstOrThrow();
				revisionIds.set(`${v.key}#${r.number}`, row.id);
				revisions++;
			}
			await trx
				.updateTable('build')
				.set({ head_revision_id: rev(v.headRevision) })
				.where('id', '=', build.id)
				.execute();
			for (const plan of v.plans) {
				const row = await trx
					.insertInto('plan')
					.values({
						vehicle_id: vehicle.id,
						name: plan.name,
						notes: plan.notes,
						base_revision_id: rev(plan.baseRevision),
						schema_version: plan.document.schemaVersion,
						document: JSON.stringify(plan.document),
						version: plan.version,
						created_by: null,
						imported_by: recorded(plan.createdByEmail),
						installed_revision_id: rev(plan.installedRevision),
						installed_at: plan.installedAt,
						created_at: plan.createdAt,
						updated_at: plan.updatedAt,
					})
					.returning('id')
					.executeTakeFirstOrThrow();
				if (plan.parts.length) {
					await trx
						.insertInto('plan_part')
						.values(
							plan.parts.map((x, position) => ({
								plan_id: row.id,
								position,
								item: x.item,
								quantity: x.quantity,
								unit_price_minor: x.unitPriceMinor,
								link: x.link,
							})),
						)
						.execute();
				}
				plans++;
			}
		}

		const eventIds = new Map<string, string>();
		for (const e of t.events) {
			const row = await trx
				.insertInto('event')
				.values({
					team_id: team.id,
					name: e.name,
					starts_on: e.startsOn,
					ends_on: e.endsOn,
					place: e.place,
					format: e.format,
					notes: e.notes,
					created_at: e.createdAt,
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			eventIds.set(e.key, row.id);
		}

		let files = 0;
		for (const [i, r] of t.runs.entries()) {
			const run = await trx
				.insertInto('run')
				.values({
					vehicle_id: vehicleIds.get(r.vehicle)!,
					event_id: r.event ? eventIds.get(r.event)! : null,
					revision_id: r.revision === null ? null : revisionIds.get(`${r.vehicle}#${r.revision}`)!,
					ran_at: r.ranAt,
					ran_at_offset_min: r.ranAtOffsetMin,
					...measurementColumns(r),
					author_id: null,
					imported_by: recorded(r.authorEmail),
					created_at: r.createdAt,
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			const samples = Array.from({ length: r.samples.length }, (_, j) => sampleAt(r.samples, j));
			for (let k = 0; k < samples.length; k += 5000) {
				await trx
					.insertInto('run_sample')
					.values(
						samples.slice(k, k + 5000).map(({ tS, volts, amps }, j) => ({
							run_id: run.id,
							seq: k + j,
							t_s: tS,
							volts,
							amps,
						})),
					)
					.execute();
			}
			if (samples.length) await storeLoggerSummary(trx, run.id, samples);
			// Photos first, so each thumbnail takes its photo's new name.
			const runFiles = [...(p.files[i] ?? [])].sort(
				(a, b) => Number(a.kind === 'thumbnail') - Number(b.kind === 'thumbnail'),
			);
			const photoBase = new Map<number, string>();
			for (const f of runFiles) {
				const objectKey = await storeFile(team.id, run.id, f, photoBase);
				await trx
					.insertInto('stored_file')
					.values({
						team_id: team.id,
						run_id: run.id,
						kind: f.kind,
						object_key: objectKey,
						file_name: f.fileName,
						content_type: f.contentType,
						size_bytes: f.bytes.byteLength,
						created_at: f.createdAt,
					})
					.execute();
				files++;
			}
		}

		for (const s of t.signoffs) {
			await trx
				.insertInto('check_signoff')
				.values({
					event_id: eventIds.get(s.event)!,
					vehicle_id: vehicleIds.get(s.vehicle)!,
					item_key: itemIds.get(s.item) ?? s.item,
					signed_by: null,
					imported_by: recorded(s.signedByEmail),
					signed_at: s.signedAt,
					note: s.note,
					waived: s.waived,
					revision_id:
						s.revision === null ? null : (revisionIds.get(`${s.vehicle}#${s.revision}`) ?? null),
					waived_value: s.waivedValue,
					waived_reasons: s.waivedReasons === null ? null : JSON.stringify(s.waivedReasons),
				})
				.execute();
		}
		return {
			teamId: team.id,
			name: team.name,
			members: 1,
			invitations: roles.size,
			vehicles: t.vehicles.length,
			revisions,
			plans,
			events: t.events.length,
			runs: t.runs.length,
			files,
		};
	});
}
