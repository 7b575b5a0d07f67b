import { z } from '@/lib/zod';
import {
	measurementNumbersShape,
	RUN_MEASUREMENTS,
	type MeasurementField,
} from './run-measurements';
import { lineText, notesText } from './text';

export const runFieldsSchema = z.object({
	vehicleId: z.uuid({ error: 'Choose a vehicle' }),
	eventId: z.uuid().nullable().default(null),
	/** Defaults to the revision in force at ranAt. */
	revisionId: z.uuid().nullable().optional(),
	/** To the second, with the offset it was entered with ("2026-06-13T14:05:09+02:00"). */
	ranAt: z.iso.datetime({ offset: true, error: 'Give the time of the run' }),
	...measurementNumbersShape,
	notes: notesText(2000).default(''),
});
export const newRunSchema = runFieldsSchema.extend({
	/** Made by the device once per run it logs: sending it again answers the run it made, never a second one. */
	clientKey: z.uuid().optional(),
	/** Log it even though a run of the vehicle at the same second with the same score exists. */
	allowDuplicate: z.boolean().default(false),
});
export const updateRunSchema = runFieldsSchema.partial().omit({ vehicleId: true });

/**
 * How far a typed voltage may sit from the logger file's own figure before the run is flagged
 * (meters and loggers read a few tenths apart; common practice, no published source).
 */
export const MISMATCH_MARGIN_V = 0.3;

/** The minutes east of UTC written in an ISO time ("+02:00" → 120, "Z" → 0); null if none. */
export function offsetMinutesOf(iso: string): number | null {
	const m = /(Z|([+-])(\d{2}):?(\d{2}))$/.exec(iso);
	if (!m) return null;
	if (m[1] === 'Z') return 0;
	return (m[2] === '-' ? -1 : 1) * (Number(m[3]) * 60 + Number(m[4]));
}
export type RunInput = Partial<z.infer<typeof runFieldsSchema>>;

export const loggerMappingSchema = z.object({
	timeColumn: lineText(100, { required: 'Choose the time column' }),
	voltsColumn: lineText(100, { required: 'Choose the voltage column' }),
	ampsColumn: lineText(100, { required: 'Choose the current column' }),
	timeUnit: z.enum(['s', 'ms']).default('s'),
});

const measuredNumbers = Object.fromEntries(
	Object.keys(RUN_MEASUREMENTS).map((f) => [f, z.number().nullable()]),
) as Record<MeasurementField, z.ZodNullable<z.ZodNumber>>;

/** A run as the browser sees it. */
export const runDtoSchema = z.object({
	id: z.uuid(),
	vehicleId: z.uuid(),
	vehicleName: z.string(),
	eventId: z.uuid().nullable(),
	eventName: z.string().nullable(),
	revisionId: z.uuid().nullable(),
	revisionNumber: z.number().int().nullable(),
	ranAt: z.string(),
	/** Minutes east of UTC the time was entered with (null for runs from before it was kept). */
	ranAtOffsetMin: z.number().int().nullable(),
	...measuredNumbers,
	notes: z.string(),
	hasLogger: z.boolean(),
	/** The logger file's own resting (before the burp) and minimum voltage. */
	logger: z.object({ restingV: z.number().nullable(), minV: z.number() }).nullable(),
	/** Typed voltages that disagree with the logger by more than MISMATCH_MARGIN_V; the analysis uses the logger's. */
	mismatches: z.array(
		z.object({ field: z.enum(['restingV', 'minV']), typedV: z.number(), loggedV: z.number() }),
	),
});
export type RunDto = z.infer<typeof runDtoSchema>;

export const runSampleSchema = z.object({ tS: z.number(), volts: z.number(), amps: z.number() });
export type RunSample = z.infer<typeof runSampleSchema>;

/** A stored photo of a run, with its thumbnail's file id. */
export const runPhotoSchema = z.object({
	id: z.uuid(),
	name: z.string(),
	thumbnailId: z.uuid().nullable(),
});
export type RunPhoto = z.infer<typeof runPhotoSchema>;

/** Which runs a list (or the CSV export) holds; ids that are not UUIDs are ignored, as before. */
const optionalId = z
	.string()
	.optional()
	.transform((s) => (s && z.uuid().safeParse(s).success ? s : undefined));
export const runListQuerySchema = z.object({ vehicleId: optionalId, eventId: optionalId });

/** The most runs one page of the runs API holds. */
export const RUNS_PAGE_MAX = 500;

/**
 * The runs API's query: the list's filters, and a page of at most `limit` runs (the newest ones,
 * or those before `before`, a run's time from the previous page's `Link: rel="next"`).
 */
export const runPageQuerySchema = runListQuerySchema.extend({
	limit: z.coerce.number().int().min(1).max(RUNS_PAGE_MAX).default(RUNS_PAGE_MAX),
	before: z.iso
		.datetime({ offset: true, error: 'before must be a run’s time (ISO 8601)' })
		.optional(),
	/** With `before`: the run at that time the page ended on (runs can share a second). */
	beforeId: z.uuid({ error: 'beforeId must be a run id' }).optional(),
});

/**
 * The revision in force at an instant: the newest one saved at or before it, compared to the
 * second (the database keeps microseconds, a run's time keeps seconds). Among revisions saved in
 * the same second the newest wins (latest save time, then highest number), as the server links
 * it (`revisionInForce`): one rule for the run form and the server.
 */
export function revisionInForceAt<R extends { createdAt: string; number?: number }>(
	revisions: readonly R[],
	at: Date,
): R | null {
	const t = at.getTime();
	if (Number.isNaN(t)) return null;
	let best: R | null = null;
	let bestAt = -Infinity;
	for (const r of revisions) {
		const savedAt = Date.parse(r.createdAt);
		if (Math.floor(savedAt / 1000) * 1000 > t) continue;
		const newer = savedAt > bestAt || (savedAt === bestAt && (r.number ?? 0) > (best?.number ?? 0));
		if (newer) {
			best = r;
			bestAt = savedAt;
		}
	}
	return best;
}
