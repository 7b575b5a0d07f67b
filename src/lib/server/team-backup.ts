import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { JSONParser } from '@streamparser/json';
import type { Kysely } from 'kysely';
import type { BuildDocument } from '@/engine';
import {
	emailsOf,
	type ImportedFile,
	insertTeamFromBackup,
	readBuildRevisions,
	readRunsDetail,
	readTeamOutline,
	readVehiclePlans,
} from '@/lib/server/db/backup';
import type { Database } from '@/lib/server/db/schema';
import { measurementsOf } from '@/lib/schemas/run-measurements';
import type { ImportSummary } from '@/lib/schemas/teams';
import {
	BACKUP_FORMAT,
	BACKUP_VERSION,
	backupEnvelopeSchema,
	PackedSamples,
	type TeamBackup,
	type TeamBackupContent,
	teamBackupContentSchema,
} from '@/lib/schemas/team-backup';
import { findControlCharacter, NOTES_MESSAGE } from '@/lib/schemas/text';
import { checkLoggerFile, checkPhoto, checkThumbnail } from '@/lib/server/file-content';
import type { Storage } from '@/lib/server/storage';
import { hashToken } from '@/lib/server/tokens';

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
	yield part('}');
	yield `,"checksum":${JSON.stringify(hash.digest('hex'))}}`;
}

/** The whole team's backup as one object (tests and small teams; the route streams). */
export async function exportTeam(db: Db, storage: Storage, teamId: string): Promise<TeamBackup> {
	let text = '';
	for await (const chunk of exportTeamChunks(db, storage, teamId)) text += chunk;
	return JSON.parse(text) as TeamBackup;
}

export type ParseBackupResult =
	| { ok: true; backup: TeamBackup }
	| {
			ok: false;
			code: 'invalid_backup' | 'unsupported_version';
			detail: string;
			errors?: { path: string; message: string }[];
	  };

const NOT_JSON =
	'This file is not a team backup: it is not valid JSON (it may be cut short or damaged).';

/** Bytes read between two turns of the event loop while a backup is parsed. */
const PARSE_SLICE = 1024 * 1024;

/**
 * Reads a backup file as it streams in, without holding its JSON whole: each run is taken out of
 * the parse as soon as it is complete, its samples packed (`PackedSamples`); the rest of the team
 * (members, documents, events, sign-offs) is kept as read. The checksum — the SHA-256 of
 * JSON.stringify(team) — is computed on the way, in the file's own order. Keys the format does not
 * have are not kept, so a file carrying any fails its checksum. Then the checks of `checkBackup`,
 * before anything is written.
 */
export async function readBackup(
	source: AsyncIterable<Uint8Array> | Iterable<Uint8Array>,
): Promise<ParseBackupResult> {
	const envelopeKeys = Object.keys(backupEnvelopeSchema.shape).filter((k) => k !== 'team');
	const teamKeys = Object.keys(teamBackupContentSchema.shape);
	const parser = new JSONParser({
		paths: [
			...envelopeKeys.map((k) => `$.${k}`),
			...teamKeys.map((k) => `$.team.${k}`),
			'$.team.runs.*',
		],
		keepStack: false,
	});
	const envelope: Record<string, unknown> = {};
	const team: Record<string, unknown> = {};
	const runs: unknown[] = [];
	const hash = createHash('sha256').update('{');
	let fields = 0;
	let runsOpen = false;
	let duplicate = false;
	const field = (k: string) => `${fields++ ? ',' : ''}${JSON.stringify(k)}:`;
	parser.onValue = ({ value, key, parent, stack }) => {
		if (stack.length === 1 && typeof key === 'string') {
			envelope[key] = value;
		} else if (stack.length === 2 && stack[1]!.key === 'team' && typeof key === 'string') {
			if (Object.hasOwn(team, key)) duplicate = true;
			if (key === 'runs' && Array.isArray(value)) {
				hash.update(runsOpen ? ']' : `${field('runs')}[]`);
				runsOpen = false;
				team.runs = runs;
			} else {
				hash.update(`${field(key)}${JSON.stringify(value)}`);
				team[key] = value;
			}
		} else if (
			stack.length === 3 &&
			stack[1]!.key === 'team' &&
			stack[2]!.key === 'runs' &&
			Array.isArray(parent)
		) {
			hash.update(runsOpen ? ',' : `${field('runs')}[`);
			runsOpen = true;
			hash.update(JSON.stringify(value));
			if (value && typeof value === 'object' && 'samples' in value) {
				const run = value as { samples: unknown };
				run.samples = PackedSamples.pack(run.samples) ?? run.samples;
			}
			runs.push(value);
			// Out of the parser's tree: only the packed copy stays.
			parent.length -= 1;
		}
	};
	try {
		let sinceTurn = 0;
		for await (const chunk of source) {
			parser.write(chunk);
			sinceTurn += chunk.byteLength;
			if (sinceTurn >= PARSE_SLICE) {
				sinceTurn = 0;
				// Other requests are served between slices of a large file.
				await new Promise((resolve) => setImmediate(resolve));
			}
		}
		if (!parser.isEnded) parser.end();
	} catch {
		return { ok: false, code: 'invalid_backup', detail: NOT_JSON };
	}
	if (duplicate)
		return {
			ok: false,
			code: 'invalid_backup',
			detail: 'This file is not a team backup from this product: a record appears twice.',
		};
	hash.update('}');
	return checkBackup({ ...envelope, team }, hash.digest('hex'));
}

/** Checks a backup file's text (small files and tests; uploads go through `readBackup`). */
export function parseBackup(text: string): Promise<ParseBackupResult> {
	return readBackup([Buffer.from(text)]);
}

/** The checks of a read file: format, version, checksum (computed as read), then every record. */
function checkBackup(raw: unknown, checksum: string): ParseBackupResult {
	const envelope = backupEnvelopeSchema.safeParse(raw);
	if (!envelope.success) {
		return {
			ok: false,
			code: 'invalid_backup',
			detail: 'This file is not a team backup from this product.',
			errors: envelope.error.issues
				.slice(0, 10)
				.map((i) => ({ path: i.path.join('.'), message: i.message })),
		};
	}
	if (envelope.data.version > BACKUP_VERSION) {
		return {
			ok: false,
			code: 'unsupported_version',
			detail: `This backup was written by a newer version of the product (format ${envelope.data.version}; this installation reads up to ${BACKUP_VERSION}). Update this installation, then import it again.`,
		};
	}
	if (checksum !== envelope.data.checksum) {
		return {
			ok: false,
			code: 'invalid_backup',
			detail:
				'This backup is damaged or was edited: its checksum does not match its contents. Nothing was imported.',
		};
	}
	const team = teamBackupContentSchema.safeParse(envelope.data.team);
	if (!team.success) {
		return {
			ok: false,
			code: 'invalid_backup',
			detail: 'This backup has records that cannot be read.',
			errors: team.error.issues
				.slice(0, 10)
				.map((i) => ({ path: `team.${i.path.join('.')}`, message: i.message })),
		};
	}
	const control = findControlCharacter(team.data);
	if (control !== null)
		return {
			ok: false,
			code: 'invalid_backup',
			detail:
				'This backup has text with control characters in it, which no field takes. Nothing was imported.',
			errors: [{ path: `team.${control}`, message: NOTES_MESSAGE }],
		};
	const problems = crossCheck(team.data);
	if (problems.length)
		return {
			ok: false,
			code: 'invalid_backup',
			detail: 'This backup refers to records it does not contain.',
			errors: problems.slice(0, 10),
		};
	return {
		ok: true,
		backup: { ...envelope.data, format: BACKUP_FORMAT, version: BACKUP_VERSION, team: team.data },
	};
}

/** References inside the file must resolve: vehicles, events, revision numbers, check items. */
function crossCheck(t: TeamBackupContent): { path: string; message: string }[] {
	const out: { path: string; message: string }[] = [];
	const vehicles = new Map(
		t.vehicles.map((v) => [v.key, new Set(v.revisions.map((r) => r.number))]),
	);
	const events = new Set(t.events.map((e) => e.key));
	const items = new Set(t.checkItems.map((i) => `manual:${i.key}`));
	t.vehicles.forEach((v, i) => {
		const nums = vehicles.get(v.key)!;
		const ref = (n: number | null, path: string) =>
			n !== null && !nums.has(n) && out.push({ path, message: `No revision ${n} in this vehicle` });
		ref(v.headRevision, `team.vehicles.${i}.headRevision`);
		v.revisions.forEach((r, j) => {
			ref(r.parent, `team.vehicles.${i}.revisions.${j}.parent`);
			ref(r.restoredFrom, `team.vehicles.${i}.revisions.${j}.restoredFrom`);
		});
		v.plans.forEach((p, j) => {
			ref(p.baseRevision, `team.vehicles.${i}.plans.${j}.baseRevision`);
			ref(p.installedRevision, `team.vehicles.${i}.plans.${j}.installedRevision`);
		});
	});
	t.runs.forEach((r, i) => {
		const nums = vehicles.get(r.vehicle);
		if (!nums) out.push({ path: `team.runs.${i}.vehicle`, message: `No vehicle ${r.vehicle}` });
		if (r.event && !events.has(r.event))
			out.push({ path: `team.runs.${i}.event`, message: `No event ${r.event}` });
		if (nums && r.revision !== null && !nums.has(r.revision))
			out.push({ path: `team.runs.${i}.revision`, message: `No revision ${r.revision}` });
		r.files.forEach(
			(f, j) =>
				Buffer.from(f.data, 'base64').byteLength !== f.sizeBytes &&
				out.push({ path: `team.runs.${i}.files.${j}`, message: 'Size does not match the bytes' }),
		);
	});
	t.signoffs.forEach((s, i) => {
		if (!events.has(s.event) || !vehicles.has(s.vehicle))
			out.push({ path: `team.signoffs.${i}`, message: 'Refers to a missing event or vehicle' });
		if (s.item.startsWith('manual:') && !items.has(s.item))
			out.push({ path: `team.signoffs.${i}.item`, message: `No check item ${s.item}` });
		const nums = vehicles.get(s.vehicle);
		if (nums && s.revision !== null && !nums.has(s.revision))
			out.push({ path: `team.signoffs.${i}.revision`, message: `No revision ${s.revision}` });
	});
	return out;
}

export type PrepareFilesResult =
	| { ok: true; files: ImportedFile[][]; photosCleaned: number }
	| { ok: false; errors: { path: string; message: string }[] };

const stem = (objectName: string) => objectName.replace(/\.[^.]*$/, '');

/**
 * Checks every file of a backup by its content, exactly as an upload is checked, before anything is
 * written: photos must be JPEG, PNG or WebP (their metadata is removed), thumbnails WebP, logger
 * files CSV text. The file's own type, object name and size are never trusted; the object name is
 * used only to pair a thumbnail with its photo inside one run.
 */
export async function prepareBackupFiles(t: TeamBackupContent): Promise<PrepareFilesResult> {
	const errors: { path: string; message: string }[] = [];
	const out: ImportedFile[][] = [];
	let photosCleaned = 0;
	for (const [i, r] of t.runs.entries()) {
		const files: ImportedFile[] = [];
		const photoByStem = new Map<string, number>();
		r.files.forEach((f, j) => f.kind === 'photo' && photoByStem.set(stem(f.objectName), j));
		for (const [j, f] of r.files.entries()) {
			const path = `team.runs.${i}.files.${j}`;
			const bytes = new Uint8Array(Buffer.from(f.data, 'base64'));
			// Its text is not needed again: let it go while the rest is checked and written.
			f.data = '';
			const base = {
				fileName: f.fileName.slice(0, 200),
				createdAt: f.createdAt,
				sourceIndex: j,
				pairedWith: null,
			};
			if (f.kind === 'photo') {
				const checked = await checkPhoto(bytes);
				if (!checked.ok)
					errors.push({ path, message: `Photo "${f.fileName}": ${checked.message}` });
				else {
					if (checked.stripped) photosCleaned++;
					files.push({ ...base, kind: 'photo', contentType: checked.type, bytes: checked.bytes });
				}
			} else if (f.kind === 'thumbnail') {
				const checked = await checkThumbnail(bytes);
				const photo = photoByStem.get(stem(f.objectName).replace(/-thumb$/, ''));
				if (!checked.ok)
					errors.push({ path, message: `Thumbnail "${f.fileName}": ${checked.message}` });
				else if (photo === undefined)
					errors.push({
						path,
						message: `Thumbnail "${f.fileName}" belongs to no photo of this run`,
					});
				else
					files.push({
						...base,
						kind: 'thumbnail',
						contentType: 'image/webp',
						bytes,
						pairedWith: photo,
					});
			} else {
				const checked = checkLoggerFile(bytes);
				if (!checked.ok)
					errors.push({ path, message: `Logger file "${f.fileName}": ${checked.message}` });
				else files.push({ ...base, kind: 'logger', contentType: 'text/csv', bytes });
			}
			if (errors.length >= 10) return { ok: false, errors };
		}
		out.push(files);
	}
	return errors.length ? { ok: false, errors } : { ok: true, files: out, photosCleaned };
}

/**
 * Writes a parsed backup as a new team, all in one transaction; files go to storage first and are
 * removed again if the transaction fails, so a failed import leaves nothing behind (a crash in
 * between leaves objects without rows, which `npm run jobs` removes). The file is untrusted input:
 * the importer becomes captain and is the only member; everyone else the file names becomes a
 * pending invitation, whether or not they have an account here (so the answer reveals nothing
 * about who does). Authors, owners and sign-offs are kept as recorded in the file, never mapped to
 * a live account. Every object key is made here, inside the new team's prefix.
 */
export async function importTeam(
	db: Db,
	storage: Storage,
	backup: TeamBackup,
	importer: { id: string; email: string },
	name: string | undefined,
	prepared: PrepareFilesResult & { ok: true },
): Promise<ImportSummary> {
	const written: string[] = [];
	try {
		const counts = await insertTeamFromBackup(
			db,
			backup.team,
			{
				importer,
				name,
				files: prepared.files,
				invitationTokenHash: () => hashToken(randomBytes(32).toString('base64url')),
			},
			async (teamId, runId, f, photoBase) => {
				let objectKey: string;
				if (f.kind === 'photo') {
					const base = `teams/${teamId}/runs/${runId}/photo-${randomUUID()}`;
					photoBase.set(f.sourceIndex, base);
					objectKey = `${base}.${f.contentType.split('/')[1]}`;
				} else if (f.kind === 'thumbnail') {
					const base =
						photoBase.get(f.pairedWith!) ?? `teams/${teamId}/runs/${runId}/photo-${randomUUID()}`;
					objectKey = `${base}-thumb.webp`;
				} else {
					objectKey = `teams/${teamId}/runs/${runId}/logger-${randomUUID()}.csv`;
				}
				written.push(objectKey);
				await storage.put(objectKey, f.bytes, f.contentType);
				return objectKey;
			},
		);
		return { ...counts, photosCleaned: prepared.photosCleaned };
	} catch (e) {
		await Promise.all(written.map((k) => storage.remove(k).catch(() => undefined)));
		throw e;
	}
}
