import type { Kysely } from 'kysely';
import type { Database, Role } from '@/lib/server/db/schema';
import { measurementColumns } from '@/lib/schemas/run-measurements';
import { sampleAt, type TeamBackupContent } from '@/lib/schemas/team-backup';
import type { ImportSummary } from '@/lib/schemas/teams';
import { storeLoggerSummary } from '@/lib/server/db/runs';
import { shelfRowValues } from '@/lib/server/db/shelf';

type Db = Kysely<Database>;

/** A file of a backup, checked by its content and ready to store. */
export interface ImportedFile {
	kind: 'logger' | 'photo' | 'thumbnail' | 'receipt';
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
	/** Where the file belongs: a run's files, or a purchase's receipt. */
	folder: { runId: string; purchaseId?: undefined } | { purchaseId: string; runId?: undefined },
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
		receipts: Map<string, ImportedFile>;
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
				viewers_may_comment: t.viewersMayComment,
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
		const planIds = new Map<string, string>(); // `${vehicleKey}#${place}` → id
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
			for (const [place, plan] of v.plans.entries()) {
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
				planIds.set(`${v.key}#${place}`, row.id);
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
		const runIds = new Map<string, string>();
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
			runIds.set(r.key, run.id);
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
				const objectKey = await storeFile(team.id, { runId: run.id }, f, photoBase);
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
		const shelfIds: string[] = [];
		for (let i = 0; i < t.shelf.length; i += 500) {
			const rows = await trx
				.insertInto('shelf_item')
				.values(
					t.shelf.slice(i, i + 500).map(({ item, createdAt }) => ({
						team_id: team.id,
						...shelfRowValues(item),
						created_at: createdAt,
						updated_at: createdAt,
					})),
				)
				.returning('id')
				.execute();
			shelfIds.push(...rows.map((r) => r.id));
		}
		for (const [seasonIndex, season] of t.seasons.entries()) {
			const { id: seasonId } = await trx
				.insertInto('season')
				.values({
					team_id: team.id,
					name: season.name,
					starts_on: season.startsOn,
					ends_on: season.endsOn,
					budget_minor: season.budgetMinor,
					created_at: season.createdAt,
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			for (let i = 0; i < season.purchases.length; i += 500) {
				const rows = await trx
					.insertInto('purchase')
					.values(
						season.purchases.slice(i, i + 500).map((p) => ({
							season_id: seasonId,
							bought_on: p.boughtOn,
							shelf_item_id: p.shelfIndex === null ? null : (shelfIds[p.shelfIndex] ?? null),
							item: p.item,
							quantity: p.quantity,
							unit_price_minor: p.unitPriceMinor,
							paid_by: null,
							paid_by_name: p.paidByName,
							imported_by: recorded(p.paidByEmail),
							notes: p.notes,
							created_at: p.createdAt,
						})),
					)
					.returning('id')
					.execute();
				// Each receipt (checked already) to storage, then its row.
				for (const [k, row] of rows.entries()) {
					const receipt = p.receipts.get(`${seasonIndex}.${i + k}`);
					if (!receipt) continue;
					const objectKey = await storeFile(team.id, { purchaseId: row.id }, receipt, new Map());
					await trx
						.insertInto('stored_file')
						.values({
							team_id: team.id,
							purchase_id: row.id,
							kind: 'receipt',
							object_key: objectKey,
							file_name: receipt.fileName,
							content_type: receipt.contentType,
							size_bytes: receipt.bytes.byteLength,
							created_at: receipt.createdAt,
						})
						.execute();
					files++;
				}
			}
		}
		// Threads: each comment beside what it named in the file (checked to exist before this).
		const subjectOf = (c: TeamBackupContent['comments'][number]) =>
			c.on === 'revision'
				? { revision_id: revisionIds.get(`${c.vehicle}#${c.revision}`)! }
				: c.on === 'plan'
					? { plan_id: planIds.get(`${c.vehicle}#${c.plan}`)! }
					: c.on === 'run'
						? { run_id: runIds.get(c.run)! }
						: { event_id: eventIds.get(c.event)! };
		for (let i = 0; i < t.comments.length; i += 500)
			await trx
				.insertInto('comment')
				.values(
					t.comments.slice(i, i + 500).map((c) => ({
						team_id: team.id,
						...subjectOf(c),
						author_id: null,
						author_name: c.authorName,
						imported_by: recorded(c.authorEmail),
						body: c.body,
						created_at: c.createdAt,
						edited_at: c.editedAt,
					})),
				)
				.execute();
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
