import { z } from '@/lib/zod';
import { lineText, notesText } from './text';
import { buildDocumentSchema, type BuildDocument } from '@/engine';

export const planNameSchema = lineText(120, {
	required: 'Give the plan a name',
	maxMessage: 'Keep the name under 120 characters',
});

/** One line of a plan's parts list. The price is per unit, in the team's currency (e.g. 129.95). */
export const planPartSchema = z.object({
	item: lineText(200, { required: 'Say what the part is' }),
	quantity: z
		.number({ error: 'Quantity is a whole number' })
		.int('Quantity is a whole number')
		.min(1, 'At least 1')
		.max(10000, 'At most 10 000'),
	unitPrice: z
		.number({ error: 'Price is a number' })
		.min(0, 'Price cannot be negative')
		.max(1_000_000_000, 'Price is too large')
		.refine(
			(v) => Math.abs(Math.round(v * 100) - v * 100) < 1e-6,
			'Prices have at most two decimals',
		),
	link: lineText(500, { maxMessage: 'Keep the link under 500 characters' }).default(''),
});
export type PlanPartInput = z.infer<typeof planPartSchema>;

export const newPlanSchema = z.object({
	name: planNameSchema,
	/** The revision the plan starts from; the build's head when left out. */
	fromRevisionId: z.uuid({ error: 'fromRevisionId must be a revision id' }).optional(),
	notes: notesText(2000).default(''),
	/**
	 * The plan's document when it is not a plain copy of the base revision (a calibration's fitted
	 * values); left out, the plan starts as that revision's document.
	 */
	document: z.optional(buildDocumentSchema),
});

export const updatePlanSchema = z.object({
	/** The version the editor loaded; a save on top of a newer one is refused with 409. */
	version: z.number().int().min(1),
	name: planNameSchema,
	notes: notesText(2000, { maxMessage: 'Keep the notes under 2000 characters' }),
	document: buildDocumentSchema,
	parts: z.array(planPartSchema).max(200, 'At most 200 parts per plan'),
});
export type UpdatePlanInput = z.infer<typeof updatePlanSchema>;

export const installPlanSchema = z.object({
	/** The build's head when the captain pressed install; a stale head answers 409. */
	parentId: z.uuid().nullable(),
	message: notesText(500).optional(),
	/**
	 * The danger findings (their keys) the installer was shown and accepts; any other the result
	 * brings answers 409 `confirm_findings` naming them, and nothing is saved.
	 */
	acceptDangers: z.array(lineText(300)).max(500).default([]),
	/** A season of the team to record the plan's parts in as purchases, paid by the installer. */
	recordPurchasesIn: z
		.uuid({ error: 'recordPurchasesIn is a season’s id' })
		.nullable()
		.default(null),
});

export const compareQuerySchema = z.object({
	plans: z
		.string()
		.transform((s) => s.split(',').filter(Boolean))
		.pipe(
			z
				.array(z.uuid({ error: 'Plan ids are UUIDs' }))
				.min(1, 'Pick at least one plan')
				.max(3, 'Compare at most three plans with the current build'),
		),
	engineRpm: z.coerce.number().min(0).max(10000).optional(),
	conductorTempC: z.coerce.number().min(-40).max(150).optional(),
});

/** One line of a plan's parts list as the browser sees it (price per unit, in the team's currency). */
export const planPartDtoSchema = z.object({
	item: z.string(),
	quantity: z.number().int(),
	unitPrice: z.number(),
	link: z.string(),
});
export type PlanPart = z.infer<typeof planPartDtoSchema>;

export const planSummarySchema = z.object({
	id: z.uuid(),
	name: z.string(),
	notes: z.string(),
	baseRevisionId: z.uuid().nullable(),
	baseRevisionNumber: z.number().int().nullable(),
	partCount: z.number().int(),
	/** Sum of quantity × unit price, in the team's currency. */
	total: z.number(),
	authorName: z.string().nullable(),
	createdAt: z.string(),
	updatedAt: z.string(),
	installedRevisionNumber: z.number().int().nullable(),
	installedAt: z.string().nullable(),
});
export type PlanSummary = z.infer<typeof planSummarySchema>;

export const planDtoSchema = planSummarySchema.extend({
	version: z.number().int(),
	document: z.custom<BuildDocument>(),
	parts: z.array(planPartDtoSchema),
});
export type PlanDto = z.infer<typeof planDtoSchema>;
