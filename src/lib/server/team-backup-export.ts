import { createHash } from 'node:crypto';

import type { Kysely } from 'kysely';
import type { BuildDocument } from '@/engine';
import {
	emailsOf,
	readBuildRevisions,
	readRunsDetail,
	readTeamOutline,
	readVehiclePlans,
} from '@/lib/server/db/backup';
import type { Database } from '@/lib/server/db/schema';
import { findShelfForBackup } from '@/lib/server/db/shelf';
import { findSeasonsForBackup } from '@/lib/server/db/seasons';
import { findCommentsForBackup } from '@/lib/server/db/comments';
import { measurementsOf } from '@/lib/schemas/run-measurements';

import {
	BACKUP_FORMAT,
	BACKUP_VERSION,
	type TeamBackup,
	type TeamBackupContent,
} from '@/lib/schemas/team-backup';

import type { Storage } from '@/lib/server/storage';

type Db = Kysely<Database>;

const iso = (d: Date) => d.toISOString();
const lastSegment = (key: string) => key.slice(key.lastIndexOf('/') + 1);

/** Runs whose samples and files are read together while a backup streams. */
const RUN_BATCH = 4;

/**
 * A whole team as a backup file, produced piece by piece: members by e-mail and role, manual check
 * items, vehicles with every revision and plan, events, runs with their logger samples and files
 * (bytes from storage), and check sign-offs. Ordered deterministically so equal teams give equal
 * files. Documents are read a vehicle at a time and samples and files a batch of runs at a time,
 * so memory holds one slice whatever the season's size; the checksum of the team's JSON is
 * computed as it goes out and written after it.
 */
export async function* exportTeamChunks(
	db: Db,
	storage: Storage,
	teamId: string,
): AsyncGenerator<string> {
	const outline = await readTeamOutline(db, teamId);
	const { team, members, items, vehicles, events, runs, signoffs } = outline;
	const emails = await emailsOf(
		db,
		[
			...vehicles.map((v) => v.owner_id),
			...outline.revisionNumbers.map((r) => r.author_id),
			...runs.map((r) => r.author_id),
			...signoffs.map((x) => x.signed_by),
		].filter((id): id is string => !!id),
	);
	const emailOf = (id: string | null) => (id ? (emails.get(id) ?? null) : null);
	const itemKey = new Map(items.map((it, i) => [`manual:${it.id}`, `manual:item${i + 1}`]));
	const vehicleKey = new Map(vehicles.map((v, i) => [v.id, `v${i + 1}`]));
	const revisionNumber = new Map(outline.revisionNumbers.map((r) => [r.id, r.number]));
	const num = (id: string | null) => (id ? (revisionNumber.get(id) ?? null) : null);
	const eventKey = new Map(events.map((e, i) => [e.id, `e${i + 1}`]));
	const runKey = new Map(runs.map((r, i) => [r.id, `run${i + 1}`]));
	/** A plan's vehicle and place among its plans, filled as the vehicles go out. */
	const planPlace = new Map<string, { vehicle: string; plan: number }>();

	const hash = createHash('sha256');
	const exportedAt = new Date().toISOString();
	yield `{"format":${JSON.stringify(BACKUP_FORMAT)},"version":${BACKUP_VERSION},"exportedAt":${JSON.stringify(exportedAt)},"team":`;
	/** A piece of the team's JSON: counted in the checksum as it goes out. */
	const part = (text: string) => {
		hash.update(text);
		return text;
	};
	/** `"name":` and the JSON of a value, after a comma unless first. */
	const field = (name: string, value: unknown, first = false) =>
		part(`${first ? '' : ','}${JSON.stringify(name)}:${JSON.stringify(value)}`);

	yield part('{') + field('name', team.name, true);
	yield field('reminderDays', team.reminder_days);
	yield field('fuseDistanceM', team.fuse_distance_m);
	yield field('currency', team.currency);
	yield field('createdAt', iso(team.created_at));
	yield field(
		'members',
		members.map((m) => ({ email: m.email, name: m.name, role: m.role })),
	);
	yield field(
		'checkItems',
		items.map((it, i) => ({ key: `item${i + 1}`, label: it.label, createdAt: iso(it.created_at) })),
	);

	yield part(',"vehicles":[');
	for (const [i, v] of vehicles.entries()) {
		const [revisions, { plans, partsByPlan }] = await Promise.all([
			readBuildRevisions(db, v.build_id),
			readVehiclePlans(db, v.id),
		]);
		const missing = plans
			.map((p) => p.created_by)
			.filter((id): id is string => !!id && !emails.has(id));
		for (const [id, email] of await emailsOf(db, missing)) emails.set(id, email);
		// The vehicle's own fields, then its revisions and plans one piece each (its last two keys):
		// no single piece is a whole vehicle's history.
		const outline: Omit<TeamBackupContent['vehicles'][number], 'revisions' | 'plans'> = {
			key: vehicleKey.get(v.id)!,
			name: v.name,
			description: v.description,
			competitionClass: v.competition_class,
			notes: v.notes,
			archivedAt: v.archived_at ? iso(v.archived_at) : null,
			ownerEmail: emailOf(v.owner_id) ?? v.imported_by,
			createdAt: iso(v.created_at),
			headRevision: num(v.head_revision_id),
		};
		yield part(`${i ? ',' : ''}${JSON.stringify(outline).slice(0, -1)},"revisions":[`);
		for (const [k, r] of revisions.entries()) {
			const revision: TeamBackupContent['vehicles'][number]['revisions'][number] = {
				number: r.number,
				parent: num(r.parent_id),
				restoredFrom: num(r.restored_from_id),
				message: r.message,
				authorEmail: emailOf(r.author_id) ?? r.imported_by,
				createdAt: iso(r.created_at),
				document: r.document as BuildDocument,
			};
			yield part(`${k ? ',' : ''}${JSON.stringify(revision)}`);
		}
		yield part('],"plans":[');
		for (const [k, p] of plans.entries()) {
			planPlace.set(p.id, { vehicle: vehicleKey.get(v.id)!, plan: k });
			const plan: TeamBackupContent['vehicles'][number]['plans'][number] = {
				name: p.name,
				notes: p.notes,
				baseRevision: num(p.base_revision_id),
				installedRevision: num(p.installed_revision_id),
				installedAt: p.installed_at ? iso(p.installed_at) : null,
				version: p.version,
				createdByEmail: emailOf(p.created_by) ?? p.imported_by,
				createdAt: iso(p.created_at),
				updatedAt: iso(p.updated_at),
				document: p.document as BuildDocument,
				parts: (partsByPlan.get(p.id) ?? []).map((x) => ({
					item: x.item,
					quantity: x.quantity,
					unitPriceMinor: Number(x.unit_price_minor),
					link: x.link,
				})),
			};
			yield part(`${k ? ',' : ''}${JSON.stringify(plan)}`);
		}
		yield part(']}');
	}
	yield part(']');

	yield field(
		'events',
		events.map((e) => ({
			key: eventKey.get(e.id)!,
			name: e.name,
			startsOn: e.starts_on,
			endsOn: e.ends_on,
			place: e.place,
			format: e.format,
			notes: e.notes,
			createdAt: iso(e.created_at),
		})),
	);

	yield part(',"runs":[');
	for (let from = 0; from < runs.length; from += RUN_BATCH) {
		const batch = runs.slice(from, from + RUN_BATCH);
		const { samplesByRun, filesByRun } = await readRunsDetail(
			db,
			batch.map((r) => r.id),
		);
		for (const [j, r] of batch.entries()) {
			const i = from + j;
			const outFiles: TeamBackupContent['runs'][number]['files'] = [];
			for (const [k, f] of (filesByRun.get(r.id) ?? []).entries()) {
				const bytes = await storage.get(f.object_key);
				if (!bytes)
					throw new Error(
						`The stored file ${f.file_name} (${f.object_key}) is missing from storage`,
					);
				outFiles.push({
					key: `run${i + 1}.f${k + 1}`,
					kind: f.kind,
					objectName: lastSegment(f.object_key),
					fileName: f.file_name,
					contentType: f.content_type,
					sizeBytes: f.size_bytes,
					createdAt: iso(f.created_at),
					data: Buffer.from(bytes).toString('base64'),
				});
			}
			const run: TeamBackupContent['runs'][number] = {
				key: `run${i + 1}`,
				vehicle: vehicleKey.get(r.vehicle_id)!,
				event: r.event_id ? (eventKey.get(r.event_id) ?? null) : null,
				revision: r.revision_id ? (revisionNumber.get(r.revision_id) ?? null) : null,
				ranAt: iso(r.ran_at),
				ranAtOffsetMin: r.ran_at_offset_min,
				...measurementsOf(r),
				authorEmail: emailOf(r.author_id) ?? r.imported_by,
				createdAt: iso(r.created_at),
				samples: (
					(samplesByRun.get(r.id) ?? []) as { t_s: number; volts: number; amps: number }[]
				).map((x) => [x.t_s, x.volts, x.amps] as [number, number, number]),
				files: outFiles,
			};
			yield part(`${i ? ',' : ''}${JSON.stringify(run)}`);
		}
	}
	yield part(']');

	yield field(
		'signoffs',
		signoffs
			.filter((x) => vehicleKey.has(x.vehicle_id))
			.map((x) => ({
				event: eventKey.get(x.event_id)!,
				vehicle: vehicleKey.get(x.vehicle_id)!,
				item: itemKey.get(x.item_key) ?? x.item_key,
				signedByEmail: emailOf(x.signed_by) ?? x.imported_by,
				signedAt: iso(x.signed_at),
				note: x.note,
				waived: x.waived,
				revision: num(x.revision_id),
				waivedValue: x.waived_value,
				waivedReasons: x.waived_reasons,
			})),
	);
	const shelf = await findShelfForBackup(db, teamId);
	yield field(
		'shelf',
		shelf.map(({ createdAt, ...x }) => ({
			item: {
				kind: x.kind,
				label: x.label,
				spec: x.spec,
				priceMinor: x.priceMinor,
				supplier: x.supplier,
				link: x.link,
				owned: x.owned,
				notes: x.notes,
			},
			createdAt,
		})),
	);
	const shelfIndex = new Map(shelf.map((x, i) => [x.id, i]));
	const seasons = await findSeasonsForBackup(db, teamId);
	const payerEmails = await emailsOf(
		db,
		seasons.flatMap((x) => x.purchases.map((p) => p.paid_by)).filter((id): id is string => !!id),
	);
	// A season at a time and a purchase at a time: receipts carry their photos' bytes.
	yield part(',"seasons":[');
	for (const [i, x] of seasons.entries()) {
		const outline = {
			name: x.name,
			startsOn: x.starts_on,
			endsOn: x.ends_on,
			budgetMinor: Number(x.budget_minor),
			createdAt: iso(x.created_at),
		};
		yield part(`${i ? ',' : ''}${JSON.stringify(outline).slice(0, -1)},"purchases":[`);
		for (const [k, p] of x.purchases.entries()) {
			const bytes = p.receipt_key ? await storage.get(p.receipt_key) : null;
			if (p.receipt_key && !bytes)
				throw new Error(`The receipt ${p.receipt_name} (${p.receipt_key}) is missing from storage`);
			const purchase: TeamBackupContent['seasons'][number]['purchases'][number] = {
				boughtOn: p.bought_on,
				shelfIndex: p.shelf_item_id ? (shelfIndex.get(p.shelf_item_id) ?? null) : null,
				item: p.item,
				quantity: p.quantity,
				unitPriceMinor: Number(p.unit_price_minor),
				paidByEmail: (p.paid_by ? payerEmails.get(p.paid_by) : null) ?? p.imported_by,
				paidByName: p.paid_by_name,
				notes: p.notes,
				createdAt: iso(p.created_at),
				receipt: bytes
					? {
							fileName: p.receipt_name!,
							createdAt: iso(p.receipt_created_at!),
							data: Buffer.from(bytes).toString('base64'),
						}
					: null,
			};
			yield part(`${k ? ',' : ''}${JSON.stringify(purchase)}`);
		}
		yield part(']}');
	}
	yield part(']');
	yield field('viewersMayComment', team.viewers_may_comment);
	const comments = await findCommentsForBackup(db, teamId);
	const authorEmails = await emailsOf(
		db,
		comments.map((c) => c.author_id).filter((id): id is string => !!id),
	);
	yield field(
		'comments',
		comments.flatMap((c): TeamBackupContent['comments'] => {
			const common = {
				authorEmail: (c.author_id ? authorEmails.get(c.author_id) : null) ?? c.imported_by,
				authorName: c.author_name,
				body: c.body,
				createdAt: iso(c.created_at),
				editedAt: c.edited_at ? iso(c.edited_at) : null,
			};
			const vehicle = c.rev_vehicle_id ? vehicleKey.get(c.rev_vehicle_id) : undefined;
			if (c.revision_id && vehicle && c.rev_number !== null)
				return [{ on: 'revision', vehicle, revision: c.rev_number, ...common }];
			const plan = c.plan_id ? planPlace.get(c.plan_id) : undefined;
			if (plan) return [{ on: 'plan', ...plan, ...common }];
			const run = c.run_id ? runKey.get(c.run_id) : undefined;
			if (run) return [{ on: 'run', run, ...common }];
			const event = c.event_id ? eventKey.get(c.event_id) : undefined;
			if (event) return [{ on: 'event', event, ...common }];
			return [];
		}),
	);
	yield part('}');
	yield `,"checksum":${JSON.stringify(hash.digest('hex'))}}`;
}

/** The whole team's backup as one object (tests and small teams; the route streams). */
export async function exportTeam(db: Db, storage: Storage, teamId: string): Promise<TeamBackup> {
	let text = '';
	for await (const chunk of exportTeamChunks(db, storage, teamId)) text += chunk;
	return JSON.parse(text) as TeamBackup;
}
