import { z } from '@/lib/zod';

export const checklistSignoffSchema = z.object({
	by: z.string().nullable(),
	at: z.string(),
	/** The sign-off's note; for a waiver, the captain's reason. */
	note: z.string(),
	/** A failing computed item accepted by a captain with a reason: never shown as passed. */
	waived: z.boolean(),
	/** The revision the sign-off or waiver was given on (null: from before it was kept). */
	revisionNumber: z.number().int().nullable().default(null),
	/**
	 * A waiver a later revision made worse: what it accepted and what the item reads now ("Waived on
	 * r3 at 0.60 V; now 2.74 V"). The item is outstanding again. Null while the waiver holds.
	 */
	reopened: z.string().nullable().default(null),
});

export const checklistItemSchema = z.object({
	key: z.string(),
	label: z.string(),
	kind: z.enum(['computed', 'manual']),
	/** Computed result; manual items are 'open' until signed off. */
	status: z.enum(['pass', 'fail', 'open']),
	reasons: z.array(z.string()),
	/** The item's figure where it has one (the worst drop, V), larger being worse. */
	measure: z.object({ value: z.number(), text: z.string() }).nullable().default(null),
	signoff: checklistSignoffSchema.nullable(),
	/** Whether the item still stands in the way: failing and not waived, or manual and unsigned. */
	outstanding: z.boolean(),
});
export type ChecklistItem = z.infer<typeof checklistItemSchema>;

/** A vehicle's pre-event checklist for one event, with what the printed sheet carries. */
export const checklistSchema = z.object({
	teamName: z.string(),
	eventId: z.uuid(),
	eventName: z.string(),
	eventPlace: z.string(),
	startsOn: z.string(),
	vehicleId: z.uuid(),
	vehicleName: z.string(),
	vehicleClass: z.string(),
	revision: z
		.object({ id: z.uuid(), number: z.number().int(), message: z.string(), savedAt: z.string() })
		.nullable(),
	fuseDistanceM: z.number(),
	units: z.enum(['imperial', 'metric']),
	items: z.array(checklistItemSchema),
});
export type Checklist = z.infer<typeof checklistSchema>;

/** The words a waiver's reason must at least have, so "ok" does not pass for one. */
export const WAIVER_MIN_CHARS = 10;
