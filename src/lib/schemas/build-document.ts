import { z } from 'zod';
import { lineText } from './text';
// From the engine's modules, not its index (the engine's input guard uses this schema), and
// relative: the engine worker's bundler does not read the @/ alias.
import { checkTopology } from '../../engine/topology';
import {
	AWG_SIZES,
	type BuildDocument,
	CHEMISTRIES,
	MATERIALS,
	NODE_KINDS,
	TERMINAL_PART_GROUPS,
} from '../../engine/types';

const id = z
	.string()
	.trim()
	.min(1, 'Give it an id')
	.max(64, 'Keep ids to 64 characters')
	.regex(/^[A-Za-z0-9_.-]+$/, 'Use letters, digits, dots, dashes and underscores only');
const label = lineText(80, {
	required: 'Give it a name',
	maxMessage: 'Keep names to 80 characters',
});
/** zod 4 numbers already refuse NaN and ±Infinity; these add the physical ranges. */
const positive = (what: string) =>
	z.number({ error: `${what} must be a number` }).positive(`${what} must be more than zero`);
const nonNegative = (what: string) =>
	z.number({ error: `${what} must be a number` }).min(0, `${what} cannot be negative`);
const fraction = (what: string) =>
	z
		.number({ error: `${what} must be a number` })
		.min(0, `${what} runs from 0 to 1`)
		.max(1, `${what} runs from 0 to 1`);

export const buildNodeSchema = z.object({
	id,
	label,
	kind: z.enum(NODE_KINDS, { error: 'Unknown node kind' }),
});

export const cableSizeSchema = z.discriminatedUnion(
	'kind',
	[
		z.object({
			kind: z.literal('awg'),
			awg: z.enum(AWG_SIZES, { error: `Unknown AWG size; use one of ${AWG_SIZES.join(', ')}` }),
		}),
		z.object({
			kind: z.literal('mm2'),
			mm2: positive('Cross-section').max(
				1000,
				'Cross-section above 1000 mm² is not a vehicle cable',
			),
		}),
		z.object({
			kind: z.literal('measured'),
			areaMm2: positive('Measured cross-section').max(
				1000,
				'Cross-section above 1000 mm² is not a vehicle cable',
			),
		}),
	],
	{ error: 'Size must be AWG, mm² or a measured cross-section' },
);

export const fuseSchema = z.object({
	ratingA: positive('Fuse rating').max(2000, 'Fuse rating above 2000 A is not plausible'),
	end: z.enum(['from', 'to'], { error: 'Fuse end is "from" or "to"' }),
	distanceM: nonNegative('Fuse distance').max(10, 'Fuse distance above 10 m is not plausible'),
});

export const cableSchema = z.object({
	id,
	label,
	from: id,
	to: id,
	size: cableSizeSchema,
	material: z.enum(MATERIALS, { error: `Unknown material; use one of ${MATERIALS.join(', ')}` }),
	lengthM: positive('Length').max(100, 'Length above 100 m is not a vehicle cable'),
	parallelRuns: z
		.number()
		.int('Parallel runs is a whole number')
		.min(1, 'At least one run')
		.max(16, 'At most 16 runs'),
	fuses: z
		.array(fuseSchema)
		.max(2, 'At most one fuse per end')
		.refine((f) => new Set(f.map((x) => x.end)).size === f.length, 'At most one fuse per end'),
	insulationC: positive('Insulation rating').max(
		250,
		'Insulation rating above 250 °C is not plausible',
	),
	connectionResistanceOhm: nonNegative('Connection resistance')
		.max(1, 'A connection above 1 Ω is an open circuit')
		.optional(),
});

const twoTerminal = { id, label, positive: id, negative: id };

export const alternatorSchema = z.object({
	...twoTerminal,
	ratedHotA: positive('Rated hot output').max(2000, 'Rated output above 2000 A is not plausible'),
	curve: z
		.array(
			z.object({
				rpm: nonNegative('Curve speed').max(30000, 'Curve speed above 30 000 rpm'),
				currentA: nonNegative('Curve current').max(2000, 'Curve current above 2000 A'),
			}),
		)
		.max(40, 'At most 40 curve points'),
	curveIsCold: z.boolean(),
	hotFactor: positive('Hot factor').max(1, 'Hot factor is at most 1'),
	pulleyRatio: positive('Pulley ratio').max(6, 'Pulley ratio above 6:1 is not plausible'),
	setPointV: positive('Set point').max(20, 'Set point above 20 V is outside a 12–16 V system'),
	sourceResistanceOhm: z
		.number()
		.min(1e-6, 'Source resistance must be at least 1 µΩ')
		.max(1, 'Source resistance above 1 Ω'),
});

export const batteryBankSchema = z.object({
	...twoTerminal,
	chemistry: z.enum(CHEMISTRIES, {
		error: `Unknown chemistry; use one of ${CHEMISTRIES.join(', ')}`,
	}),
	cellsPerUnit: z
		.number()
		.int('Cells is a whole number')
		.min(1, 'At least one cell')
		.max(8, 'At most 8 cells per unit'),
	unitsInSeries: z
		.number()
		.int('Units in series is a whole number')
		.min(1, 'At least one unit')
		.max(4, 'At most 4 units in series'),
	stringsInParallel: z
		.number()
		.int('Strings is a whole number')
		.min(1, 'At least one string')
		.max(40, 'At most 40 strings'),
	unitCapacityAh: positive('Capacity').max(5000, 'Capacity above 5000 Ah is not plausible'),
	ratedHours: positive('Rated hours').max(100, 'Rated hours above 100 h'),
	unitResistanceOhm: positive('Internal resistance').max(1, 'Internal resistance above 1 Ω'),
	stateOfCharge: fraction('State of charge'),
	peukertK: z
		.number()
		.min(1, 'Peukert exponent is at least 1')
		.max(2, 'Peukert exponent above 2 is not plausible')
		.nullable(),
	absorptionV: positive('Absorption voltage').max(25, 'Absorption voltage above 25 V').nullable(),
	floatV: positive('Float voltage').max(25, 'Float voltage above 25 V').nullable(),
	maxChargeC: positive('Charge acceptance').max(10, 'Charge acceptance above 10 C').nullable(),
	location: z.enum(['engine_bay', 'cabin', 'trunk', 'exterior'], { error: 'Unknown location' }),
	secured: z.boolean(),
	vented: z.boolean(),
});

export const amplifierSchema = z.object({
	...twoTerminal,
	ratedPowerW: positive('Rated power').max(100000, 'Rated power above 100 kW per amplifier'),
	ratedVoltageV: positive('Rated voltage').max(20, 'Rated voltage above 20 V'),
	efficiency: positive('Efficiency').max(1, 'Efficiency is at most 1 (100 %)'),
	quantity: z
		.number()
		.int('Quantity is a whole number')
		.min(1, 'At least one')
		.max(50, 'At most 50'),
	regulated: z.boolean(),
	maxOutputW: positive('Maximum output')
		.max(200000, 'Maximum output above 200 kW per amplifier')
		.nullable()
		.optional(),
});

export const steadyLoadSchema = z.object({
	...twoTerminal,
	currentA: nonNegative('Current').max(1000, 'Current above 1000 A'),
});

function checkReferences(doc: z.infer<typeof looseBuildSchema>, ctx: z.RefinementCtx) {
	const nodes = new Set<string>();
	doc.nodes.forEach((n, i) => {
		if (nodes.has(n.id))
			ctx.addIssue({
				code: 'custom',
				path: ['nodes', i, 'id'],
				message: `Node id "${n.id}" is used twice`,
			});
		nodes.add(n.id);
	});
	const chassis = doc.nodes.filter((n) => n.kind === 'chassis').length;
	if (chassis !== 1) {
		ctx.addIssue({
			code: 'custom',
			path: ['nodes'],
			message:
				chassis === 0
					? 'The build needs one chassis node (the 0 V reference)'
					: 'Only one node can be the chassis',
		});
	}
	const ref = (path: (string | number)[], nodeId: string) => {
		if (!nodes.has(nodeId))
			ctx.addIssue({ code: 'custom', path, message: `No node named "${nodeId}"` });
	};
	const parts = new Set<string>();
	for (const group of TERMINAL_PART_GROUPS) {
		doc[group].forEach((p, i) => {
			ref([group, i, 'positive'], p.positive);
			ref([group, i, 'negative'], p.negative);
			if (p.positive === p.negative)
				ctx.addIssue({
					code: 'custom',
					path: [group, i, 'negative'],
					message: 'Positive and negative must be different nodes',
				});
			if (parts.has(p.id))
				ctx.addIssue({
					code: 'custom',
					path: [group, i, 'id'],
					message: `Id "${p.id}" is used twice`,
				});
			parts.add(p.id);
		});
	}
	doc.cables.forEach((c, i) => {
		ref(['cables', i, 'from'], c.from);
		ref(['cables', i, 'to'], c.to);
		if (c.from === c.to)
			ctx.addIssue({
				code: 'custom',
				path: ['cables', i, 'to'],
				message: 'A cable must join two different nodes',
			});
		if (parts.has(c.id))
			ctx.addIssue({
				code: 'custom',
				path: ['cables', i, 'id'],
				message: `Id "${c.id}" is used twice`,
			});
		parts.add(c.id);
	});
}

const looseBuildSchema = z.object({
	schemaVersion: z.literal(1, { error: 'Unsupported build document version; this is version 1' }),
	nodes: z.array(buildNodeSchema).min(1, 'A build needs nodes').max(500, 'At most 500 nodes'),
	alternators: z.array(alternatorSchema).max(8, 'At most 8 alternators'),
	banks: z.array(batteryBankSchema).max(40, 'At most 40 banks'),
	amplifiers: z.array(amplifierSchema).max(100, 'At most 100 amplifiers'),
	loads: z.array(steadyLoadSchema).max(100, 'At most 100 loads'),
	cables: z.array(cableSchema).max(1000, 'At most 1000 cables'),
});

/**
 * The build document, version 1. Field errors carry their path (e.g. `cables.2.lengthM`).
 * Topology — every node reaching the chassis, every load fed by a source — is the engine's
 * `checkTopology`, which `parseBuildDocument` also runs.
 */
export const buildDocumentSchema: z.ZodType<BuildDocument> =
	looseBuildSchema.superRefine(checkReferences);

export interface BuildDocumentProblem {
	path: string;
	message: string;
}

export type ParseBuildResult =
	{ ok: true; doc: BuildDocument } | { ok: false; problems: BuildDocumentProblem[] };

/** Validates a build document from unknown input: fields (zod), then topology (the engine). */
export function parseBuildDocument(input: unknown): ParseBuildResult {
	const parsed = buildDocumentSchema.safeParse(input);
	if (!parsed.success) {
		return {
			ok: false,
			problems: parsed.error.issues.map((i) => ({
				path: i.path.map(String).join('.'),
				message: i.message,
			})),
		};
	}
	const issues = checkTopology(parsed.data);
	if (issues.length > 0)
		return { ok: false, problems: issues.map(({ path, message }) => ({ path, message })) };
	return { ok: true, doc: parsed.data };
}
