import { z } from '@/lib/zod';
import { lineText, notesText } from './text';
import { buildDocumentSchema, type BuildDocument } from '@/engine';

export const vehicleFieldsSchema = z.object({
	name: lineText(80, { required: 'Give the vehicle a name' }),
	description: lineText(200).default(''),
	competitionClass: lineText(80).default(''),
	notes: notesText(2000).default(''),
	ownerId: z.string().max(64).nullable().default(null),
});
export const newVehicleSchema = vehicleFieldsSchema;
export const updateVehicleSchema = vehicleFieldsSchema
	.partial()
	.extend({ archived: z.boolean().optional() });

export const revisionMessageSchema = notesText(500, {
	required: 'Say what changed and why',
	maxMessage: 'Keep the message under 500 characters',
});

export const newRevisionSchema = z.object({
	/** The revision the draft started from; null only for a build's first revision. */
	parentId: z.uuid({ error: 'parentId must be a revision id' }).nullable(),
	message: revisionMessageSchema,
	document: buildDocumentSchema,
});

export const restoreRevisionSchema = z.object({
	parentId: z.uuid().nullable(),
	message: revisionMessageSchema.optional(),
});

const numberParam = (min: number, max: number) => z.coerce.number().min(min).max(max);

/** Scenario controls as query parameters of the report route (all optional). */
export const scenarioQuerySchema = z.object({
	engineRpm: numberParam(0, 10000).optional(),
	sustainedDemand: numberParam(0, 1).optional(),
	burpDemand: numberParam(0, 2).optional(),
	conductorTempC: numberParam(-40, 150).optional(),
	dropTargetV: numberParam(0.01, 5).optional(),
	voltagesV: z
		.string()
		.transform((s) => s.split(',').map(Number))
		.pipe(
			z.array(z.number().min(6, 'Voltages from 6 V').max(20, 'Voltages up to 20 V')).min(1).max(12),
		)
		.optional(),
	burpSeconds: numberParam(0.1, 60).optional(),
	burpStepS: numberParam(0.001, 1).optional(),
	fuseDistanceM: numberParam(0.01, 3).optional(),
});

/** A vehicle as the browser sees it. */
export const vehicleDtoSchema = z.object({
	id: z.uuid(),
	name: z.string(),
	description: z.string(),
	competitionClass: z.string(),
	notes: z.string(),
	ownerId: z.string().nullable(),
	archived: z.boolean(),
	createdAt: z.string(),
	headRevisionId: z.uuid().nullable(),
});
export type VehicleDto = z.infer<typeof vehicleDtoSchema>;

/** A revision in a build's history, without its document. */
export const revisionSummarySchema = z.object({
	id: z.uuid(),
	number: z.number().int(),
	parentId: z.uuid().nullable(),
	message: z.string(),
	authorName: z.string().nullable(),
	createdAt: z.string(),
	restoredFromNumber: z.number().int().nullable(),
});
export type RevisionSummary = z.infer<typeof revisionSummarySchema>;

/** A revision with its (already validated) build document. */
export const revisionDtoSchema = revisionSummarySchema.extend({
	schemaVersion: z.number().int(),
	document: z.custom<BuildDocument>(),
});
export type RevisionDto = z.infer<typeof revisionDtoSchema>;

/** `?archived=true` lists the archived vehicles; anything else the ones in use. */
export const vehicleListQuerySchema = z.object({
	archived: z
		.string()
		.optional()
		.transform((s) => s === 'true'),
});
