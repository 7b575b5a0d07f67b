import {
	linkParts,
	PART_KINDS,
	partsOf,
	terminalParts,
	type LinkPart,
	type TerminalPart,
} from './part-kinds';
import type { BuildDocument, PartGroup } from './types';

export interface TopologyIssue {
	code:
		| 'no_chassis'
		| 'several_chassis'
		| 'unknown_node'
		| 'same_terminals'
		| 'not_connected'
		| 'no_source'
		| 'duplicate_id'
		/** A field the schema refuses (a document handed to the engine without validation). */
		| 'invalid_field';
	/** Path of the offending field, e.g. `cables.3.to`. */
	path: string;
	message: string;
}

function find(parent: Map<string, string>, x: string): string {
	let root = x;
	while (parent.get(root) !== root) root = parent.get(root)!;
	let cur = x;
	while (parent.get(cur) !== root) {
		const next = parent.get(cur)!;
		parent.set(cur, root);
		cur = next;
	}
	return root;
}

function union(parent: Map<string, string>, a: string, b: string) {
	const ra = find(parent, a);
	const rb = find(parent, b);
	if (ra !== rb) parent.set(ra, rb);
}

/**
 * Checks that a build is a network the engine can solve: one chassis node; every reference names
 * a node; every node reaches the chassis through cables, banks or alternators (amplifiers and
 * loads draw current but conduct nothing); and every group of nodes joined by cables that feeds an
 * amplifier or load also holds a source terminal. Returns the issues; empty means solvable.
 */
export function checkTopology(doc: BuildDocument): TopologyIssue[] {
	const issues: TopologyIssue[] = [];
	const chassis = doc.nodes.filter((n) => n.kind === 'chassis');
	if (chassis.length === 0)
		issues.push({
			code: 'no_chassis',
			path: 'nodes',
			message: 'The build needs one chassis node (the 0 V reference).',
		});
	if (chassis.length > 1) {
		issues.push({
			code: 'several_chassis',
			path: 'nodes',
			message: `Only one node can be the chassis; found ${chassis.map((n) => n.id).join(', ')}.`,
		});
	}
	const ids = new Set<string>();
	doc.nodes.forEach((n, i) => {
		if (ids.has(n.id))
			issues.push({
				code: 'duplicate_id',
				path: `nodes.${i}.id`,
				message: `Node id "${n.id}" is used twice.`,
			});
		ids.add(n.id);
	});
	const partIds = new Set<string>();
	for (const group of Object.keys(PART_KINDS) as PartGroup[]) {
		if (group === 'nodes') continue;
		partsOf(doc, group).forEach((part, i) => {
			if (partIds.has(part.id))
				issues.push({
					code: 'duplicate_id',
					path: `${group}.${i}.id`,
					message: `Id "${part.id}" is used twice.`,
				});
			partIds.add(part.id);
		});
	}
	const check = (path: string, nodeId: string) => {
		if (!ids.has(nodeId))
			issues.push({ code: 'unknown_node', path, message: `No node named "${nodeId}".` });
	};
	for (const [group, parts] of terminalParts(doc)) {
		parts.forEach((part, i) => {
			check(`${group}.${i}.positive`, part.positive);
			check(`${group}.${i}.negative`, part.negative);
			if (part.positive === part.negative) {
				issues.push({
					code: 'same_terminals',
					path: `${group}.${i}.negative`,
					message: `"${part.label}" has both terminals on node "${part.positive}".`,
				});
			}
		});
	}
	for (const [group, parts] of linkParts(doc)) {
		parts.forEach((c, i) => {
			check(`${group}.${i}.from`, c.from);
			check(`${group}.${i}.to`, c.to);
			if (c.from === c.to)
				issues.push({
					code: 'same_terminals',
					path: `${group}.${i}.to`,
					message: `${PART_KINDS[group].one} "${c.label}" starts and ends on "${c.from}".`,
				});
		});
	}
	if (issues.length > 0 || chassis.length !== 1) return issues;

	// Conductive connectivity to the chassis (a relay counts whatever its state: this checks the
	// wiring; an open one leaves its side to the sources there).
	const conductive = new Map(doc.nodes.map((n) => [n.id, n.id]));
	const { links, sources } = conductorsOf(doc);
	for (const c of links) union(conductive, c.from, c.to);
	for (const s of sources) union(conductive, s.positive, s.negative);
	const ground = find(conductive, chassis[0]!.id);
	doc.nodes.forEach((n, i) => {
		if (find(conductive, n.id) !== ground) {
			issues.push({
				code: 'not_connected',
				path: `nodes.${i}`,
				message: `Node "${n.label}" is not connected to the chassis through cables, relays, banks or alternators.`,
			});
		}
	});

	// Every group of nodes joined by cables and relays that feeds a load holds a source terminal.
	const byLink = new Map(doc.nodes.map((n) => [n.id, n.id]));
	for (const c of links) union(byLink, c.from, c.to);
	const fed = new Set<string>();
	for (const s of sources) {
		fed.add(find(byLink, s.positive));
		fed.add(find(byLink, s.negative));
	}
	for (const [group, parts] of terminalParts(doc)) {
		if (PART_KINDS[group].conducts) continue;
		parts.forEach((part, i) => {
			if (!fed.has(find(byLink, part.positive))) {
				issues.push({
					code: 'no_source',
					path: `${group}.${i}.positive`,
					message: `Nothing feeds "${part.label}": no battery bank or alternator is wired to node "${part.positive}".`,
				});
			}
		});
	}
	return issues;
}

/** The parts that join nodes (cables, relays) and the sources, as the registry says. */
function conductorsOf(doc: BuildDocument): { links: LinkPart[]; sources: TerminalPart[] } {
	const links = linkParts(doc)
		.filter(([group]) => PART_KINDS[group].conducts)
		.flatMap(([, parts]) => parts);
	const sources = terminalParts(doc)
		.filter(([group]) => PART_KINDS[group].source)
		.flatMap(([, parts]) => parts);
	return { links, sources };
}
