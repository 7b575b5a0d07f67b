import { z } from 'zod';

export const checklistItemSchema = z.object({
	key: z.string(),
	label: z.string(),
	kind: z.enum(['computed', 'manual']),
	/** Computed result; manual items are 'open' until signed off. */
	status: z.enum(['pass', 'fail', 'open']),
	reasons: z.array(z.string()),
	signoff: z.object({ by: z.string().nullable(), at: z.string(), note: z.string() }).nullable(),
});
export type ChecklistItem = z.infer<typeof checklistItemSchema>;

/** A vehicle's pre-event checklist for one event. */
export const checklistSchema = z.object({
	eventId: z.uuid(),
	eventName: z.string(),
	startsOn: z.string(),
	vehicleId: z.uuid(),
	vehicleName: z.string(),
	revision: z.object({ id: z.uuid(), number: z.number().int() }).nullable(),
	fuseDistanceM: z.number(),
	items: z.array(checklistItemSchema),
});
export type Checklist = z.infer<typeof checklistSchema>;
