import { type BuildDocument, TERMINAL_PART_GROUPS } from './types';

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
	for (const group of [...TERMINAL_PART_GROUPS, 'cables'] as const) {
		doc[group].forEach((part, i) => {
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
	for (const group of TERMINAL_PART_GROUPS) {
		doc[group].forEach((part, i) => {
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
	doc.cables.forEach((c, i) => {
		check(`cables.${i}.from`, c.from);
		check(`cables.${i}.to`, c.to);
		if (c.from === c.to)
			issues.push({
				code: 'same_terminals',
				path: `cables.${i}.to`,
				message: `Cable "${c.label}" starts and ends on "${c.from}".`,
			});
	});
	if (issues.length > 0 || chassis.length !== 1) return issues;

	// Conductive connectivity to the chassis.
	const conductive = new Map(doc.nodes.map((n) => [n.id, n.id]));
	for (const c of doc.cables) union(conductive, c.from, c.to);
	for (const s of [...doc.banks, ...doc.alternators]) union(conductive, s.positive, s.negative);
	const ground = find(conductive, chassis[0]!.id);
	doc.nodes.forEach((n, i) => {
		if (find(conductive, n.id) !== ground) {
			issues.push({
				code: 'not_connected',
				path: `nodes.${i}`,
				message: `Node "${n.label}" is not connected to the chassis through cables, banks or alternators.`,
			});
		}
	});

	// Every cable-joined group that feeds a load holds a source terminal.
	const byCable = new Map(doc.nodes.map((n) => [n.id, n.id]));
	for (const c of doc.cables) union(byCable, c.from, c.to);
	const fed = new Set<string>();
	for (const s of [...doc.banks, ...doc.alternators]) {
		fed.add(find(byCable, s.positive));
		fed.add(find(byCable, s.negative));
	}
	for (const group of ['amplifiers', 'loads'] as const) {
		doc[group].forEach((part, i) => {
			if (!fed.has(find(byCable, part.positive))) {
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
