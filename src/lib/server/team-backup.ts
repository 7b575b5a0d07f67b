import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { JSONParser } from '@streamparser/json';
import type { Kysely } from 'kysely';
import { insertTeamFromBackup } from '@/lib/server/db/backup-insert';
import type { PrepareFilesResult } from '@/lib/server/team-backup-files';

export { prepareBackupFiles, type PrepareFilesResult } from '@/lib/server/team-backup-files';
import type { Database } from '@/lib/server/db/schema';
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
import type { Storage } from '@/lib/server/storage';
import { hashToken } from '@/lib/server/tokens';

type Db = Kysely<Database>;

export { exportTeam, exportTeamChunks } from '@/lib/server/team-backup-export';

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

/** References inside the file must resolve: vehicles, events, revision numbers, check items, shelf entries, what comments are beside. */
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
	t.seasons.forEach((season, i) => {
		if (season.endsOn < season.startsOn)
			out.push({ path: `team.seasons.${i}.endsOn`, message: 'Ends before it starts' });
		season.purchases.forEach((p, j) => {
			if (p.shelfIndex !== null && p.shelfIndex >= t.shelf.length)
				out.push({
					path: `team.seasons.${i}.purchases.${j}.shelfIndex`,
					message: `No shelf entry ${p.shelfIndex}`,
				});
		});
	});
	const runs = new Set(t.runs.map((r) => r.key));
	const plans = new Map(t.vehicles.map((v) => [v.key, v.plans.length]));
	t.comments.forEach((c, i) => {
		const path = `team.comments.${i}`;
		if (c.on === 'revision' && !vehicles.get(c.vehicle)?.has(c.revision))
			out.push({ path, message: `No revision ${c.revision} of vehicle ${c.vehicle}` });
		if (c.on === 'plan' && !(c.plan < (plans.get(c.vehicle) ?? 0)))
			out.push({ path, message: `No plan ${c.plan} of vehicle ${c.vehicle}` });
		if (c.on === 'run' && !runs.has(c.run)) out.push({ path, message: `No run ${c.run}` });
		if (c.on === 'event' && !events.has(c.event))
			out.push({ path, message: `No event ${c.event}` });
	});
	return out;
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
				receipts: prepared.receipts,
				invitationTokenHash: () => hashToken(randomBytes(32).toString('base64url')),
			},
			async (teamId, folder, f, photoBase) => {
				let objectKey: string;
				const runId = folder.runId;
				if (f.kind === 'receipt') {
					objectKey = `teams/${teamId}/receipts/${folder.purchaseId}/receipt-${randomUUID()}.${f.contentType.split('/')[1]}`;
				} else if (f.kind === 'photo') {
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
