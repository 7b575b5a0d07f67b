import type { BuildDocument, PartGroup } from './types';

/**
 * What the whole engine knows about one kind of part, in one place. The topology check, the
 * document schema (its counts and references), the diff's names, the SPICE export and the
 * interface's own registry (src/components/builds/part-kinds.tsx) read these facts; each is a
 * `Record<PartGroup, …>`, so the compiler names every place a new kind is missing.
 */
export interface PartKindFacts {
	/** One part, as a line of a diff or a finding names it: "Steady load". */
	one: string;
	/** The group's heading: "Steady loads". */
	many: string;
	/** Prefix of the ids new parts get: `load-1`. */
	idPrefix: string;
	/** How findings and hints name the kind of the part they concern (`element.kind`). */
	element: string;
	/** The fields that name its nodes: a two-terminal part's, a link's, or none (a node itself). */
	ends: 'terminals' | 'link' | 'none';
	/** Current passes through it between its ends (it joins nodes, for the topology check). */
	conducts: boolean;
	/** It delivers energy (a battery bank, an alternator): what feeds amplifiers and loads. */
	source: boolean;
	/** Most parts of this kind in one document (the schema's bound). */
	most: number;
}

export const PART_KINDS = {
	nodes: {
		one: 'Node',
		many: 'Nodes',
		idPrefix: 'node',
		element: 'node',
		ends: 'none',
		conducts: false,
		source: false,
		most: 500,
	},
	alternators: {
		one: 'Alternator',
		many: 'Alternators',
		idPrefix: 'alt',
		element: 'alternator',
		ends: 'terminals',
		conducts: true,
		source: true,
		most: 8,
	},
	banks: {
		one: 'Bank',
		many: 'Battery banks',
		idPrefix: 'bank',
		element: 'bank',
		ends: 'terminals',
		conducts: true,
		source: true,
		most: 40,
	},
	amplifiers: {
		one: 'Amplifier',
		many: 'Amplifiers',
		idPrefix: 'amp',
		element: 'amplifier',
		ends: 'terminals',
		conducts: false,
		source: false,
		most: 100,
	},
	loads: {
		one: 'Steady load',
		many: 'Steady loads',
		idPrefix: 'load',
		element: 'load',
		ends: 'terminals',
		conducts: false,
		source: false,
		most: 100,
	},
	cables: {
		one: 'Cable',
		many: 'Cables',
		idPrefix: 'cable',
		element: 'cable',
		ends: 'link',
		conducts: true,
		source: false,
		most: 1000,
	},
	isolators: {
		one: 'Isolator',
		many: 'Relays and isolators',
		idPrefix: 'iso',
		element: 'isolator',
		ends: 'link',
		conducts: true,
		source: false,
		most: 40,
	},
	capacitors: {
		one: 'Capacitor bank',
		many: 'Capacitor banks',
		idPrefix: 'cap',
		element: 'capacitor',
		ends: 'terminals',
		// At a steady point only its leakage flows: it joins nothing and feeds nothing there.
		conducts: false,
		source: false,
		most: 20,
	},
	chargers: {
		one: 'DC-DC charger',
		many: 'DC-DC chargers',
		idPrefix: 'dcdc',
		element: 'charger',
		ends: 'link',
		// It moves energy from one side to the other through its converter, not along a wire.
		conducts: false,
		source: false,
		most: 8,
	},
} as const satisfies Record<PartGroup, PartKindFacts>;

/** The parts of one group (a group a document predates reads as empty). */
export function partsOf<G extends PartGroup>(
	doc: BuildDocument,
	group: G,
): NonNullable<BuildDocument[G]> {
	return (doc[group] ?? []) as NonNullable<BuildDocument[G]>;
}

/** A part with a positive and a negative terminal. */
export interface TerminalPart {
	id: string;
	label: string;
	positive: string;
	negative: string;
}

/** A part joining two nodes: a cable, a relay. */
export interface LinkPart {
	id: string;
	label: string;
	from: string;
	to: string;
}

const groupsWith = (ends: PartKindFacts['ends']) =>
	(Object.keys(PART_KINDS) as PartGroup[]).filter((g) => PART_KINDS[g].ends === ends);

/** The groups whose parts have a positive and a negative terminal. */
export const TERMINAL_GROUPS = groupsWith('terminals') as ReadonlyArray<
	'alternators' | 'banks' | 'amplifiers' | 'loads' | 'capacitors'
>;
/** The groups whose parts join two nodes. */
export const LINK_GROUPS = groupsWith('link') as ReadonlyArray<'cables' | 'isolators' | 'chargers'>;

/** Every part of the document that has terminals, with its group. */
export function terminalParts(doc: BuildDocument): Array<[PartGroup, TerminalPart[]]> {
	return TERMINAL_GROUPS.map((g) => [g, partsOf(doc, g) as TerminalPart[]]);
}

/** Every part of the document that joins two nodes, with its group. */
export function linkParts(doc: BuildDocument): Array<[PartGroup, LinkPart[]]> {
	return LINK_GROUPS.map((g) => [g, partsOf(doc, g) as LinkPart[]]);
}
