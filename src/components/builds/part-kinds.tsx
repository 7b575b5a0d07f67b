import type { BuildDocument, NodeKind, PartGroup, UnitSystem } from '@/engine/browser';
import type { Opt } from './column-kit';
import {
	alternatorColumns,
	amplifierColumns,
	bankColumns,
	cableColumns,
	capacitorColumns,
	chargerColumns,
	isolatorColumns,
	loadColumns,
	nodeColumns,
} from './editor-columns';
import {
	newAlternator,
	newAmplifier,
	newBank,
	newCable,
	newCapacitor,
	newCharger,
	newIsolator,
	newLoad,
	newNode,
} from './new-parts';
import type { PartColumn } from './PartTable';

type PartOf<G extends PartGroup> = NonNullable<BuildDocument[G]>[number];

/** A field of the add-part form that places a part: which of its ends, and how it is asked. */
export interface EndField {
	key: 'from' | 'to' | 'positive' | 'negative';
	label: string;
}

/**
 * What the interface knows about one kind of part: its table's columns (the inspector shows the
 * same fields), a new part with its defaults, how the add form asks where it goes, and how the
 * diagram draws it. Names, counts and the finding element come from the engine's PART_KINDS.
 */
export interface UiPartKind<G extends PartGroup> {
	columns: (nodes: Opt, units: UnitSystem) => PartColumn<PartOf<G>>[];
	make: (doc: BuildDocument) => PartOf<G>;
	/** The add form's questions, one per end (none for a node). */
	ends: EndField[];
	/** The kind of a node the add form makes for one of its ends. */
	newNodeKind: NodeKind;
	/** Where a new part most likely connects: the add form's suggestion for each end. */
	suggest: (doc: BuildDocument) => Record<string, string>;
	/** The diagram: a box in a column between two terminals, an arc between two nodes, or a node. */
	glyph: { shape: 'box'; colour: string } | { shape: 'arc'; dash?: string } | { shape: 'node' };
}

/** The add form's choice "a new node for it". */
export const NEW_NODE = '__new__';

const byKind = (d: BuildDocument, kind: NodeKind) => d.nodes.find((n) => n.kind === kind)?.id;
const chassisOf = (d: BuildDocument) => byKind(d, 'chassis') ?? d.nodes[0]?.id ?? NEW_NODE;
const batteryOf = (d: BuildDocument) => byKind(d, 'battery') ?? d.nodes[0]?.id ?? NEW_NODE;

const TERMINALS = (positive: string, negative: string): EndField[] => [
	{ key: 'positive', label: positive },
	{ key: 'negative', label: negative },
];

export const UI_PART_KINDS: { [G in PartGroup]: UiPartKind<G> } = {
	nodes: {
		columns: () => nodeColumns(),
		make: newNode,
		ends: [],
		newNodeKind: 'block',
		suggest: () => ({}),
		glyph: { shape: 'node' },
	},
	cables: {
		columns: cableColumns,
		make: newCable,
		ends: [
			{ key: 'from', label: 'From node' },
			{ key: 'to', label: 'To node' },
		],
		newNodeKind: 'block',
		suggest: (d) => {
			const battery = batteryOf(d);
			const wired = new Set(d.cables.flatMap((c) => [c.from, c.to]));
			const loose = d.nodes.find((n) => !wired.has(n.id) && n.id !== battery)?.id;
			return { from: battery, to: loose ?? byKind(d, 'block') ?? NEW_NODE };
		},
		glyph: { shape: 'arc' },
	},
	banks: {
		columns: (nodes) => bankColumns(nodes),
		make: newBank,
		ends: TERMINALS('Positive terminal', 'Negative terminal'),
		newNodeKind: 'battery',
		suggest: (d) => ({ positive: NEW_NODE, negative: chassisOf(d) }),
		glyph: { shape: 'box', colour: '#0f7076' },
	},
	alternators: {
		columns: (nodes) => alternatorColumns(nodes),
		make: newAlternator,
		ends: TERMINALS('Output (B+)', 'Case ground'),
		newNodeKind: 'alternator',
		suggest: (d) => ({
			positive: byKind(d, 'alternator') ?? NEW_NODE,
			negative: byKind(d, 'junction') ?? chassisOf(d),
		}),
		glyph: { shape: 'box', colour: '#0f7076' },
	},
	amplifiers: {
		columns: (nodes) => amplifierColumns(nodes),
		make: newAmplifier,
		ends: TERMINALS('Power input (+)', 'Ground input (−)'),
		newNodeKind: 'amplifier',
		suggest: () => ({ positive: NEW_NODE, negative: NEW_NODE }),
		glyph: { shape: 'box', colour: '#a85a23' },
	},
	loads: {
		columns: (nodes) => loadColumns(nodes),
		make: newLoad,
		ends: TERMINALS('Fed from', 'Returns to'),
		newNodeKind: 'block',
		suggest: (d) => ({ positive: batteryOf(d), negative: chassisOf(d) }),
		glyph: { shape: 'box', colour: '#55616b' },
	},
	isolators: {
		columns: (nodes) => isolatorColumns(nodes),
		make: newIsolator,
		ends: [
			{ key: 'from', label: 'Supply side (from)' },
			{ key: 'to', label: 'Far side (to)' },
		],
		newNodeKind: 'battery',
		// Most often between the starting bank's node and the rear banks' own.
		suggest: (d) => ({ from: batteryOf(d), to: NEW_NODE }),
		glyph: { shape: 'arc', dash: '2 5' },
	},
	capacitors: {
		columns: (nodes) => capacitorColumns(nodes),
		make: newCapacitor,
		ends: TERMINALS('Positive terminal', 'Negative terminal'),
		newNodeKind: 'block',
		// Beside the amplifiers: on their positive node, to the chassis.
		suggest: (d) => ({
			positive: byKind(d, 'amplifier') ?? byKind(d, 'block') ?? NEW_NODE,
			negative: chassisOf(d),
		}),
		glyph: { shape: 'box', colour: '#6b4c9a' },
	},
	chargers: {
		columns: (nodes) => chargerColumns(nodes),
		make: newCharger,
		ends: [
			{ key: 'from', label: 'Input from' },
			{ key: 'to', label: 'Output to (the bank it charges)' },
		],
		newNodeKind: 'battery',
		// From the first bank's node to another bank's, when the build has a second one.
		suggest: (d) => {
			const from = d.banks[0]?.positive ?? batteryOf(d);
			const other = d.banks.map((b) => b.positive).find((p) => p !== from);
			return { from, to: other ?? NEW_NODE };
		},
		glyph: { shape: 'arc', dash: '9 3 2 3' },
	},
};

/** The part tables' order on the page: the wiring first, the nodes last. */
export const EDITOR_ORDER: readonly PartGroup[] = [
	'cables',
	'isolators',
	'banks',
	'capacitors',
	'chargers',
	'alternators',
	'amplifiers',
	'loads',
	'nodes',
];
