import { describe, expect, it } from 'vitest';
import { EDITOR_ORDER, NEW_NODE, UI_PART_KINDS } from '@/components/builds/part-kinds';
import { INSPECTOR_FIGURES } from '@/components/builds/Inspector';
import {
	buildReport,
	DEFAULT_SCENARIO,
	diffBuilds,
	PART_GROUPS,
	PART_KINDS,
	parseBuildDocument,
	partsOf,
	toSpiceNetlist,
	type BuildDocument,
	type PartGroup,
} from '@/engine';
import { GROUP_NAMES } from '@/lib/format';
import { COMPILED_LIST, compileNetwork } from '../../src/engine/network';
import { SPICE_DEVICES } from '../../src/engine/spice';
import { oldOakBuild } from '../../db/demo/builds';

/** The demo build with one new part of the group, its ends where the add form suggests. */
function withNew(group: PartGroup): { doc: BuildDocument; id: string } {
	const base = structuredClone(oldOakBuild);
	const kind = UI_PART_KINDS[group];
	const ends = kind.suggest(base);
	const nodes = [...base.nodes];
	const at: Record<string, string> = {};
	for (const end of kind.ends) {
		const chosen = ends[end.key];
		if (chosen && chosen !== NEW_NODE) at[end.key] = chosen;
		else {
			const id = `new-${end.key}`;
			nodes.push({ id, label: id, kind: kind.newNodeKind });
			at[end.key] = id;
		}
	}
	const withNodes = { ...base, nodes };
	const part = { ...kind.make(withNodes), ...at };
	let doc = { ...withNodes, [group]: [...partsOf(withNodes, group), part] } as BuildDocument;
	// As the add form's "also add its feed cable" does: a part that conducts nothing is wired in.
	if (!PART_KINDS[group].conducts && PART_KINDS[group].ends === 'terminals') {
		const battery = doc.nodes.find((n) => n.kind === 'battery')!.id;
		const chassis = doc.nodes.find((n) => n.kind === 'chassis')!.id;
		const wire = (id: string, from: string, to: string) => ({
			...UI_PART_KINDS.cables.make(doc),
			id,
			from,
			to,
		});
		const extra = [];
		if (at.positive!.startsWith('new-')) extra.push(wire('new-feed', battery, at.positive!));
		if (at.negative!.startsWith('new-')) extra.push(wire('new-ground', at.negative!, chassis));
		doc = { ...doc, cables: [...doc.cables, ...extra] };
	}
	// A charger's new output node gets the bank it charges.
	if (
		!PART_KINDS[group].conducts &&
		PART_KINDS[group].ends === 'link' &&
		at.to!.startsWith('new-')
	) {
		const chassis = doc.nodes.find((n) => n.kind === 'chassis')!.id;
		doc = {
			...doc,
			banks: [
				...doc.banks,
				{ ...UI_PART_KINDS.banks.make(doc), id: 'new-aux', positive: at.to!, negative: chassis },
			],
		};
	}
	return { doc, id: part.id };
}

describe('the part-kind registry: every kind has every face', () => {
	it('lists the same kinds in the engine, the document and the interface', () => {
		expect(Object.keys(PART_KINDS).sort()).toEqual([...PART_GROUPS].sort());
		expect(Object.keys(UI_PART_KINDS).sort()).toEqual([...PART_GROUPS].sort());
		expect([...EDITOR_ORDER].sort()).toEqual([...PART_GROUPS].sort());
		expect(Object.keys(INSPECTOR_FIGURES).sort()).toEqual([...PART_GROUPS].sort());
		const elements = PART_GROUPS.map((g) => PART_KINDS[g].element);
		expect(new Set(elements).size).toBe(elements.length);
		for (const g of PART_GROUPS) {
			expect(GROUP_NAMES[g]).toBe(PART_KINDS[g].one);
			expect(PART_KINDS[g].many.length).toBeGreaterThan(0);
			expect(PART_KINDS[g].most).toBeGreaterThan(0);
		}
	});

	it('asks for the ends the engine reads: terminals, the two ends of a link, or none', () => {
		for (const g of PART_GROUPS) {
			const keys = UI_PART_KINDS[g].ends.map((e) => e.key);
			const expected = {
				terminals: ['positive', 'negative'],
				link: ['from', 'to'],
				none: [],
			}[PART_KINDS[g].ends];
			expect(keys, g).toEqual(expected);
		}
	});

	it.each(PART_GROUPS.filter((g) => g !== 'nodes'))(
		'a new %s with its defaults makes a valid document the engine reports on, diffs and exports',
		(group) => {
			const { doc, id } = withNew(group);
			const parsed = parseBuildDocument(doc);
			expect(parsed, JSON.stringify(parsed.ok ? '' : parsed.problems)).toMatchObject({ ok: true });
			const report = buildReport(doc, DEFAULT_SCENARIO, { burpRun: false });
			expect(report.ok).toBe(true);
			const changes = diffBuilds(oldOakBuild, doc);
			expect(changes).toContainEqual(expect.objectContaining({ group, id, kind: 'added' }));
			// The solver compiles it, one entry per part, and the SPICE export writes its devices.
			const conditions = { engineRpm: 1500, demand: 1, conductorTempC: 25 };
			const list = COMPILED_LIST[group];
			expect(list).not.toBeNull();
			const net = compileNetwork(doc, conditions);
			expect((net[list!] as unknown[]).length).toBe(partsOf(doc, group).length);
			const { netlist } = toSpiceNetlist(doc, conditions);
			const k = partsOf(doc, group).length;
			expect(
				SPICE_DEVICES[group].some((prefix) => new RegExp(`^${prefix}${k} `, 'm').test(netlist)),
				`${group}: no ${SPICE_DEVICES[group].join('/')}${k} line`,
			).toBe(true);
			if (report.ok)
				expect(() => INSPECTOR_FIGURES[group](id, report, doc, 'metric')).not.toThrow();
		},
	);

	it.each(PART_GROUPS)('every column of %s edits a field the schema checks', (group) => {
		const { doc, id } =
			group === 'nodes' ? { doc: oldOakBuild, id: oldOakBuild.nodes[0]!.id } : withNew(group);
		const part = (partsOf(doc, group) as Array<{ id: string }>).find((p) => p.id === id)!;
		const nodes = doc.nodes.map((n) => ({ value: n.id, label: n.label }));
		const columns = UI_PART_KINDS[group].columns(nodes, 'metric') as unknown as Array<{
			header: string;
			errorPath: string | ((row: unknown) => string);
		}>;
		expect(columns.length).toBeGreaterThan(1);
		for (const col of columns) {
			expect(col.header.length, `${group} column`).toBeGreaterThan(0);
			const path = typeof col.errorPath === 'string' ? col.errorPath : col.errorPath(part);
			const top = path.split('.')[0]!;
			// Optional fields may be absent on a new part; the rest are there with their defaults.
			if (top in part) continue;
			expect(['fuses', 'connectionResistanceOhm', 'maxOutputW'], `${group}.${path}`).toContain(top);
		}
	});
});
