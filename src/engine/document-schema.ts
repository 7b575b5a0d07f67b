// zod's small build: the build page validates every keystroke with this schema in the browser,
// and the full build would nearly double the script that page loads. Schemas of the full build
// take these as they are (`z.object({ document: buildDocumentSchema })`).
import * as z from 'zod/mini';
import en from 'zod/v4/locales/en.js';
import { hasLineControl, LINE_MESSAGE } from './text-rules';
// The engine's input contract: its guard checks every document by it, and the server's routes and
// the build page's editor take it from here (through the index). Relative imports: the engine
// worker's bundler does not read the @/ alias.
import { checkTopology } from './topology';
import {
	AWG_SIZES,
	type BuildDocument,
	CHEMISTRIES,
	ISOLATOR_KINDS,
	ISOLATOR_STATES,
	MATERIALS,
	NODE_KINDS,
	type PartGroup,
	PROTECTION_DEVICES,
} from './types';
import { linkParts, PART_KINDS, terminalParts } from './part-kinds';

// The small build carries no messages of its own; these are the full build's English ones.
z.config(en());

const id = z
	.string()
	.check(
		z.trim(),
		z.minLength(1, 'Give it an id'),
		z.maxLength(64, 'Keep ids to 64 characters'),
		z.regex(/^[A-Za-z0-9_.-]+$/, 'Use letters, digits, dots, dashes and underscores only'),
	);
const label = z.string({ error: 'Must be text' }).check(
	z.trim(),
	z.minLength(1, 'Give it a name'),
	z.maxLength(80, 'Keep names to 80 characters'),
	z.refine((v) => !hasLineControl(v), LINE_MESSAGE),
);
/** A number with bounds: zod 4 numbers already refuse NaN and ±Infinity. */
const num = (what: string | null, ...checks: z.core.$ZodCheck<number>[]) =>
	z.number(what ? { error: `${what} must be a number` } : undefined).check(...checks);
const positive = (what: string, max: number, maxMessage: string) =>
	num(what, z.positive(`${what} must be more than zero`), z.lte(max, maxMessage));
const nonNegative = (what: string, max: number, maxMessage: string) =>
	num(what, z.gte(0, `${what} cannot be negative`), z.lte(max, maxMessage));
const fraction = (what: string) =>
	num(what, z.gte(0, `${what} runs from 0 to 1`), z.lte(1, `${what} runs from 0 to 1`));
const whole = (message: string, min: [number, string], max: [number, string]) =>
	num(null, z.int(message), z.gte(min[0], min[1]), z.lte(max[0], max[1]));

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
			mm2: positive('Cross-section', 1000, 'Cross-section above 1000 mm² is not a vehicle cable'),
		}),
		z.object({
			kind: z.literal('measured'),
			areaMm2: positive(
				'Measured cross-section',
				1000,
				'Cross-section above 1000 mm² is not a vehicle cable',
			),
		}),
	],
	{ error: 'Size must be AWG, mm² or a measured cross-section' },
);

export const fuseSchema = z.object({
	ratingA: positive('Fuse rating', 2000, 'Fuse rating above 2000 A is not plausible'),
	end: z.enum(['from', 'to'], { error: 'Fuse end is "from" or "to"' }),
	distanceM: nonNegative('Fuse distance', 10, 'Fuse distance above 10 m is not plausible'),
	device: z.optional(
		z.enum(PROTECTION_DEVICES, { error: 'Protection is a "fuse" or a "breaker"' }),
	),
	contactResistanceOhm: z.optional(
		nonNegative(
			'Holder resistance',
			0.01,
			'Holder resistance above 10 mΩ is a failing contact, not a holder',
		),
	),
});

export const cableSchema = z.object({
	id,
	label,
	from: id,
	to: id,
	size: cableSizeSchema,
	material: z.enum(MATERIALS, { error: `Unknown material; use one of ${MATERIALS.join(', ')}` }),
	lengthM: positive('Length', 100, 'Length above 100 m is not a vehicle cable'),
	parallelRuns: whole(
		'Parallel runs is a whole number',
		[1, 'At least one run'],
		[16, 'At most 16 runs'],
	),
	fuses: z.array(fuseSchema).check(
		z.maxLength(2, 'At most one fuse per end'),
		z.refine((f) => new Set(f.map((x) => x.end)).size === f.length, 'At most one fuse per end'),
	),
	insulationC: positive(
		'Insulation rating',
		250,
		'Insulation rating above 250 °C is not plausible',
	),
	connectionResistanceOhm: z.optional(
		nonNegative('Connection resistance', 1, 'A connection above 1 Ω is an open circuit'),
	),
});

const twoTerminal = { id, label, positive: id, negative: id };

export const capacitorBankSchema = z.object({
	...twoTerminal,
	moduleFarads: positive('Capacitance', 100000, 'Capacitance above 100 000 F per module'),
	moduleEsrOhm: num(
		'Series resistance',
		z.gte(1e-6, 'Series resistance must be at least 1 µΩ'),
		z.lte(1, 'Series resistance above 1 Ω'),
	),
	moduleRatedV: positive('Rated voltage', 100, 'Rated voltage above 100 V per module'),
	moduleLeakageA: nonNegative('Leakage', 1, 'Leakage above 1 A is a failed module'),
	inSeries: whole('Modules in series is a whole number', [1, 'At least one'], [12, 'At most 12']),
	inParallel: whole('Strings is a whole number', [1, 'At least one'], [20, 'At most 20']),
});

export const dcDcChargerSchema = z.object({
	id,
	label,
	from: id,
	to: id,
	targetV: positive('Target voltage', 20, 'Target voltage above 20 V is outside a 12–16 V system'),
	maxOutputA: positive('Output limit', 500, 'Output limit above 500 A is not plausible'),
	efficiency: positive('Efficiency', 1, 'Efficiency is at most 1 (100 %)'),
	runs: z.enum(ISOLATOR_STATES, {
		error: 'It runs with the engine running ("engine_running"), "always" or never ("open")',
	}),
});

export const isolatorSchema = z.object({
	id,
	label,
	from: id,
	to: id,
	kind: z.enum(ISOLATOR_KINDS, { error: 'An isolator is a "relay" or a "diode"' }),
	closes: z.enum(ISOLATOR_STATES, {
		error: 'It closes with the engine running ("engine_running"), "always" or never ("open")',
	}),
	closedResistanceOhm: num(
		'Closed resistance',
		z.gte(1e-6, 'Closed resistance must be at least 1 µΩ'),
		z.lte(1, 'Closed resistance above 1 Ω is an open circuit'),
	),
	forwardDropV: nonNegative('Forward drop', 2, 'Forward drop above 2 V is not an isolator diode'),
});

export const alternatorSchema = z.object({
	...twoTerminal,
	ratedHotA: positive('Rated hot output', 2000, 'Rated output above 2000 A is not plausible'),
	curve: z
		.array(
			z.object({
				rpm: nonNegative('Curve speed', 30000, 'Curve speed above 30 000 rpm'),
				currentA: nonNegative('Curve current', 2000, 'Curve current above 2000 A'),
			}),
		)
		.check(z.maxLength(40, 'At most 40 curve points')),
	curveIsCold: z.boolean(),
	hotFactor: positive('Hot factor', 1, 'Hot factor is at most 1'),
	pulleyRatio: positive('Pulley ratio', 6, 'Pulley ratio above 6:1 is not plausible'),
	setPointV: positive('Set point', 20, 'Set point above 20 V is outside a 12–16 V system'),
	sourceResistanceOhm: num(
		null,
		z.gte(1e-6, 'Source resistance must be at least 1 µΩ'),
		z.lte(1, 'Source resistance above 1 Ω'),
	),
});

export const batteryBankSchema = z.object({
	...twoTerminal,
	chemistry: z.enum(CHEMISTRIES, {
		error: `Unknown chemistry; use one of ${CHEMISTRIES.join(', ')}`,
	}),
	cellsPerUnit: whole(
		'Cells is a whole number',
		[1, 'At least one cell'],
		[8, 'At most 8 cells per unit'],
	),
	unitsInSeries: whole(
		'Units in series is a whole number',
		[1, 'At least one unit'],
		[4, 'At most 4 units in series'],
	),
	stringsInParallel: whole(
		'Strings is a whole number',
		[1, 'At least one string'],
		[40, 'At most 40 strings'],
	),
	unitCapacityAh: positive('Capacity', 5000, 'Capacity above 5000 Ah is not plausible'),
	ratedHours: positive('Rated hours', 100, 'Rated hours above 100 h'),
	unitResistanceOhm: positive('Internal resistance', 1, 'Internal resistance above 1 Ω'),
	stateOfCharge: fraction('State of charge'),
	peukertK: z.nullable(
		num(
			null,
			z.gte(1, 'Peukert exponent is at least 1'),
			z.lte(2, 'Peukert exponent above 2 is not plausible'),
		),
	),
	absorptionV: z.nullable(positive('Absorption voltage', 25, 'Absorption voltage above 25 V')),
	floatV: z.nullable(positive('Float voltage', 25, 'Float voltage above 25 V')),
	maxChargeC: z.nullable(positive('Charge acceptance', 10, 'Charge acceptance above 10 C')),
	location: z.enum(['engine_bay', 'cabin', 'trunk', 'exterior'], { error: 'Unknown location' }),
	secured: z.boolean(),
	vented: z.boolean(),
});

export const amplifierSchema = z.object({
	...twoTerminal,
	ratedPowerW: positive('Rated power', 100000, 'Rated power above 100 kW per amplifier'),
	ratedVoltageV: positive('Rated voltage', 20, 'Rated voltage above 20 V'),
	efficiency: positive('Efficiency', 1, 'Efficiency is at most 1 (100 %)'),
	quantity: whole('Quantity is a whole number', [1, 'At least one'], [50, 'At most 50']),
	regulated: z.boolean(),
	maxOutputW: z.optional(
		z.nullable(positive('Maximum output', 200000, 'Maximum output above 200 kW per amplifier')),
	),
});

export const steadyLoadSchema = z.object({
	...twoTerminal,
	currentA: nonNegative('Current', 1000, 'Current above 1000 A'),
});

function checkReferences(
	doc: z.infer<typeof looseBuildSchema>,
	ctx: z.core.$RefinementCtx<z.infer<typeof looseBuildSchema>>,
) {
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
	const unique = (group: PartGroup, i: number, partId: string) => {
		if (parts.has(partId))
			ctx.addIssue({
				code: 'custom',
				path: [group, i, 'id'],
				message: `Id "${partId}" is used twice`,
			});
		parts.add(partId);
	};
	for (const [group, list] of terminalParts(doc as BuildDocument)) {
		list.forEach((p, i) => {
			ref([group, i, 'positive'], p.positive);
			ref([group, i, 'negative'], p.negative);
			if (p.positive === p.negative)
				ctx.addIssue({
					code: 'custom',
					path: [group, i, 'negative'],
					message: 'Positive and negative must be different nodes',
				});
			unique(group, i, p.id);
		});
	}
	for (const [group, list] of linkParts(doc as BuildDocument)) {
		list.forEach((c, i) => {
			ref([group, i, 'from'], c.from);
			ref([group, i, 'to'], c.to);
			if (c.from === c.to)
				ctx.addIssue({
					code: 'custom',
					path: [group, i, 'to'],
					message: `A ${PART_KINDS[group].one.toLowerCase()} must join two different nodes`,
				});
			unique(group, i, c.id);
		});
	}
}

/** A group's list, bounded by the registry's count for it. */
const listOf = <T extends z.ZodMiniType>(group: PartGroup, part: T) =>
	z
		.array(part)
		.check(
			z.maxLength(
				PART_KINDS[group].most,
				`At most ${PART_KINDS[group].most} ${PART_KINDS[group].many.toLowerCase()}`,
			),
		);

const looseBuildSchema = z.object({
	schemaVersion: z.literal(1, { error: 'Unsupported build document version; this is version 1' }),
	nodes: listOf('nodes', buildNodeSchema).check(z.minLength(1, 'A build needs nodes')),
	alternators: listOf('alternators', alternatorSchema),
	banks: listOf('banks', batteryBankSchema),
	amplifiers: listOf('amplifiers', amplifierSchema),
	loads: listOf('loads', steadyLoadSchema),
	cables: listOf('cables', cableSchema),
	isolators: z.optional(listOf('isolators', isolatorSchema)),
	capacitors: z.optional(listOf('capacitors', capacitorBankSchema)),
	chargers: z.optional(listOf('chargers', dcDcChargerSchema)),
});

/**
 * The build document, version 1. Field errors carry their path (e.g. `cables.2.lengthM`).
 * Topology — every node reaching the chassis, every load fed by a source — is the engine's
 * `checkTopology`, which `parseBuildDocument` also runs.
 */
export const buildDocumentSchema: z.ZodMiniType<BuildDocument> = looseBuildSchema.check(
	z.superRefine(checkReferences),
);

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
