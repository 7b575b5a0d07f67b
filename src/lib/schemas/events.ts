import { z } from '@/lib/zod';
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
export const newEventSchema = eventFieldsSchema.refine((e) => e.endsOn >= e.startsOn, {
	path: ['endsOn'],
	message: 'The event cannot end before it starts',
});
export const updateEventSchema = eventFieldsSchema.partial();

/** An event as the browser sees it. */
export const eventDtoSchema = z.object({
	id: z.uuid(),
	name: z.string(),
	startsOn: z.string(),
	endsOn: z.string(),
	place: z.string(),
	format: z.string(),
	notes: z.string(),
});
export type EventDto = z.infer<typeof eventDtoSchema>;
