import { z } from 'zod';
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
	ranAt: z.iso.datetime({ offset: true, error: 'Give the time of the run' }),
	...measurementNumbersShape,
	notes: notesText(2000).default(''),
});
export const newRunSchema = runFieldsSchema;
export const updateRunSchema = runFieldsSchema.partial().omit({ vehicleId: true });
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
	...measuredNumbers,
	notes: z.string(),
	hasLogger: z.boolean(),
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
