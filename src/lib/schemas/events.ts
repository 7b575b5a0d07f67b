import { z } from 'zod';
import { lineText, notesText } from './text';

const day = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date like 2026-06-14');

export const eventFieldsSchema = z.object({
	name: lineText(120, { required: 'Give the event a name' }),
	startsOn: day,
	endsOn: day,
	place: lineText(200).default(''),
	format: lineText(120).default(''),
	notes: notesText(2000).default(''),
});
export const newEventSchema = eventFieldsSchema.refine((e) => e.endsOn >= e.startsOn, { path: ['endsOn'], message: 'The event cannot end before it starts' });
export const updateEventSchema = eventFieldsSchema.partial();

const optionalNumber = (min: number, max: number, what: string) => z.number({ error: `${what} must be a number` }).min(min, `${what} from ${min}`).max(max, `${what} up to ${max}`).nullable().default(null);

export const runFieldsSchema = z.object({
	vehicleId: z.uuid({ error: 'Choose a vehicle' }),
	eventId: z.uuid().nullable().default(null),
	/** Defaults to the revision in force at ranAt. */
	revisionId: z.uuid().nullable().optional(),
	ranAt: z.iso.datetime({ offset: true, error: 'Give the time of the run' }),
	scoreDb: optionalNumber(0, 200, 'Score'),
	frequencyHz: optionalNumber(1, 20000, 'Frequency'),
	restingV: optionalNumber(0, 30, 'Resting voltage'),
	minV: optionalNumber(0, 30, 'Minimum voltage'),
	ambientC: optionalNumber(-40, 70, 'Ambient temperature'),
	notes: notesText(2000).default(''),
});
export const newRunSchema = runFieldsSchema;
export const updateRunSchema = runFieldsSchema.partial().omit({ vehicleId: true });

export const loggerMappingSchema = z.object({
	timeColumn: lineText(100, { required: 'Choose the time column' }),
	voltsColumn: lineText(100, { required: 'Choose the voltage column' }),
	ampsColumn: lineText(100, { required: 'Choose the current column' }),
	timeUnit: z.enum(['s', 'ms']).default('s'),
});
