import { z } from '@/lib/zod';
import { buildDocumentSchema } from '@/engine';
import { measurementNumbersShape } from './run-measurements';
import { shelfItemSchema } from './shelf';
import { COMMENT_MAX_CHARS } from './comments';
import { notesText } from './text';

/**
 * A whole team as one file. Records refer to each other by keys local to the file (`v1`, `v1.r3`,
 * `e2`, `run4`, `item1`), never by database ids, so the same team exported from two installations
 * gives the same file. `checksum` is the SHA-256 of JSON.stringify(team), so a damaged or edited
 * file is refused before anything is written.
 */
export const BACKUP_FORMAT = 'sagwise-team-backup';
export const BACKUP_VERSION = 1;

const iso = z.iso.datetime({ offset: true });
const day = z.iso.date();
const key = z.string().min(1).max(40);
const email = z.email().max(320);
const role = z.enum(['captain', 'member', 'viewer']);

/**
 * A run's logger samples held packed while a backup is read: seconds, volts and amps of each sample
 * one after another in one Float64Array (24 bytes a sample, where three-number arrays cost about
 * a hundred). It writes back as the file's `[[t, V, A], …]`, so the checksum of what was read is the
 * checksum of the file.
 */
export class PackedSamples {
	constructor(readonly values: Float64Array) {}
	get length(): number {
		return this.values.length / 3;
	}
	/** Packs `[[t, V, A], …]`, or answers null when it is anything else (left for the schema to refuse). */
	static pack(value: unknown): PackedSamples | null {
		if (!Array.isArray(value)) return null;
		const out = new Float64Array(value.length * 3);
		for (let i = 0; i < value.length; i++) {
			const s: unknown = value[i];
			if (!Array.isArray(s) || s.length !== 3) return null;
			for (let j = 0; j < 3; j++) {
				const x: unknown = s[j];
				if (typeof x !== 'number' || !Number.isFinite(x)) return null;
				out[i * 3 + j] = x;
			}
		}
		return new PackedSamples(out);
	}
	toJSON(): Array<[number, number, number]> {
		const out: Array<[number, number, number]> = [];
		for (let i = 0; i < this.values.length; i += 3)
			out.push([this.values[i]!, this.values[i + 1]!, this.values[i + 2]!]);
		return out;
	}
}

/** Samples as a run's `[[t, V, A], …]` (what an export builds) or packed (what an import reads). */
const samplesSchema = z.union([
	z.instanceof(PackedSamples),
	z.array(z.tuple([z.number(), z.number(), z.number()])),
]);

/** The i-th sample of either form. */
export function sampleAt(
	s: PackedSamples | ReadonlyArray<readonly [number, number, number]>,
	i: number,
): { tS: number; volts: number; amps: number } {
	if (s instanceof PackedSamples)
		return { tS: s.values[i * 3]!, volts: s.values[i * 3 + 1]!, amps: s.values[i * 3 + 2]! };
	const [tS, volts, amps] = s[i]!;
	return { tS, volts, amps };
}

export const backupFileSchema = z.object({
	key,
	kind: z.enum(['logger', 'photo', 'thumbnail']),
	/** The last part of the object key (a photo and its thumbnail are paired by it). */
	objectName: z.string().min(1).max(300),
	fileName: z.string().max(300),
	contentType: z.string().max(120),
	sizeBytes: z.number().int().min(0),
	createdAt: iso,
	/** The bytes, base64. */
	data: z.base64(),
});

const commentFields = {
	authorEmail: email.nullable(),
	/** The author as the team knew them when they wrote. */
	authorName: z.string().max(200),
	body: notesText(COMMENT_MAX_CHARS, { required: 'A comment has text' }),
	createdAt: iso,
	editedAt: iso.nullable(),
};
const backupCommentSchema = z.discriminatedUnion('on', [
	z.object({
		on: z.literal('revision'),
		vehicle: key,
		revision: z.number().int().positive(),
		...commentFields,
	}),
	z.object({ on: z.literal('run'), run: key, ...commentFields }),
	z.object({
		on: z.literal('plan'),
		vehicle: key,
		plan: z.number().int().min(0).max(10_000),
		...commentFields,
	}),
	z.object({ on: z.literal('event'), event: key, ...commentFields }),
]);

export const teamBackupContentSchema = z.object({
	name: z.string().min(1).max(80),
	reminderDays: z.number().int().min(0).max(60),
	fuseDistanceM: z.number().positive().max(3),
	currency: z.string().regex(/^[A-Z]{3}$/),
	createdAt: iso,
	members: z.array(z.object({ email, name: z.string().max(200).nullable(), role })).max(500),
	checkItems: z
		.array(z.object({ key, label: z.string().min(1).max(200), createdAt: iso }))
		.max(500),
	vehicles: z.array(
		z.object({
			key,
			name: z.string().min(1).max(80),
			description: z.string().max(200),
			competitionClass: z.string().max(80),
			notes: z.string().max(2000),
			archivedAt: iso.nullable(),
			ownerEmail: email.nullable(),
			createdAt: iso,
			headRevision: z.number().int().positive().nullable(),
			revisions: z.array(
				z.object({
					number: z.number().int().positive(),
					parent: z.number().int().positive().nullable(),
					restoredFrom: z.number().int().positive().nullable(),
					message: z.string().max(500),
					authorEmail: email.nullable(),
					createdAt: iso,
					document: buildDocumentSchema,
				}),
			),
			plans: z.array(
				z.object({
					name: z.string().min(1).max(120),
					notes: z.string().max(2000),
					baseRevision: z.number().int().positive().nullable(),
					installedRevision: z.number().int().positive().nullable(),
					installedAt: iso.nullable(),
					version: z.number().int().min(1),
					createdByEmail: email.nullable(),
					createdAt: iso,
					updatedAt: iso,
					document: buildDocumentSchema,
					parts: z
						.array(
							z.object({
								item: z.string().min(1).max(200),
								quantity: z.number().int().min(1),
								unitPriceMinor: z.number().int().min(0),
								link: z.string().max(500),
							}),
						)
						.max(200),
				}),
			),
		}),
	),
	events: z.array(
		z.object({
			key,
			name: z.string().min(1).max(120),
			startsOn: day,
			endsOn: day,
			place: z.string().max(200),
			format: z.string().max(120),
			notes: z.string().max(2000),
			createdAt: iso,
		}),
	),
	runs: z.array(
		z.object({
			key,
			vehicle: key,
			event: key.nullable(),
			revision: z.number().int().positive().nullable(),
			ranAt: iso,
			/** Minutes east of UTC the time was entered with; older files have none. */
			ranAtOffsetMin: z.number().int().min(-900).max(900).nullable().default(null),
			...measurementNumbersShape,
			notes: z.string().max(2000),
			authorEmail: email.nullable(),
			createdAt: iso,
			/** Logger samples as [seconds, volts, amps]. */
			samples: samplesSchema,
			files: z.array(backupFileSchema),
		}),
	),
	signoffs: z.array(
		z.object({
			event: key,
			vehicle: key,
			item: z.string().min(1).max(200),
			signedByEmail: email.nullable(),
			signedAt: iso,
			note: z.string().max(500),
			/** A failing computed item accepted with a reason (the note); older files have none. */
			waived: z.boolean().default(false),
			/** The revision (its number) the sign-off was given on; older files have none. */
			revision: z.number().int().positive().nullable().default(null),
			/** What a waiver accepted: the item's figure and its findings then; older files have none. */
			waivedValue: z.number().nullable().default(null),
			waivedReasons: z.array(z.string().max(2000)).max(500).nullable().default(null),
		}),
	),
	/** The team's seasons with their budgets and purchases; older files have none. */
	seasons: z
		.array(
			z.object({
				name: z.string().trim().min(1).max(80),
				startsOn: day,
				endsOn: day,
				budgetMinor: z.number().int().min(0).max(100_000_000_000),
				createdAt: iso,
				purchases: z
					.array(
						z.object({
							boughtOn: day,
							/** The shelf entry bought, by its place in the file's shelf (from 0). */
							shelfIndex: z.number().int().min(0).max(1999).nullable(),
							item: z.string().trim().min(1).max(200),
							quantity: z.number().int().min(1).max(10_000),
							unitPriceMinor: z.number().int().min(0).max(100_000_000_000),
							paidByEmail: email.nullable(),
							paidByName: z.string().max(200),
							notes: z.string().max(500),
							createdAt: iso,
							/** The receipt photo, checked on restore as an upload is; older files have none. */
							receipt: z
								.object({
									fileName: z.string().max(300),
									createdAt: iso,
									/** The bytes, base64. */
									data: z.base64(),
								})
								.nullable()
								.default(null),
						}),
					)
					.max(5000),
			}),
		)
		.max(200)
		.default([]),
	/** Whether viewers may comment; older files have none (off). */
	viewersMayComment: z.boolean().default(false),
	/**
	 * The comment threads, each comment naming what it is beside: a revision (its vehicle and
	 * number), a plan (its vehicle and place in that vehicle's plans, from 0), a run or an event
	 * (their keys). Older files have none.
	 */
	comments: z.array(backupCommentSchema).max(20_000).default([]),
	/** The team's parts shelf, each entry checked as the shelf's own route checks it; older files have none. */
	shelf: z
		.array(z.object({ item: shelfItemSchema, createdAt: iso }))
		.max(2000)
		.default([]),
});
export type TeamBackupContent = z.infer<typeof teamBackupContentSchema>;

/** The envelope, read first: format and version decide whether the rest is read at all. */
export const backupEnvelopeSchema = z.object({
	format: z.literal(BACKUP_FORMAT),
	version: z.number().int().min(1),
	exportedAt: iso,
	checksum: z.string().regex(/^[0-9a-f]{64}$/),
	team: z.unknown(),
});

export interface TeamBackup {
	format: typeof BACKUP_FORMAT;
	version: typeof BACKUP_VERSION;
	exportedAt: string;
	checksum: string;
	team: TeamBackupContent;
}
