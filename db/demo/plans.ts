import type { BuildDocument } from '../../src/engine/types';
import type { PlanPartInput } from '../../src/lib/schemas/plans';
import { oldOakBuild } from './builds';

/** Invented demo data: two upgrade plans for the flagship, with invented prices. */
export interface DemoPlan {
	vehicle: 'Old Oak';
	name: string;
	notes: string;
	author: number;
	/** The day, fixed in the demo season (YYYY-MM-DD). */
	on: string;
	document: BuildDocument;
	parts: PlanPartInput[];
}

function change(doc: BuildDocument, f: (d: BuildDocument) => void): BuildDocument {
	const next = structuredClone(doc);
	f(next);
	return next;
}

export const DEMO_PLANS: DemoPlan[] = [
	{
		vehicle: 'Old Oak',
		name: 'Third alternator on a new bracket',
		notes: 'Needs the custom bracket and a longer belt; check the belt wrap before ordering.',
		author: 0,
		on: '2026-09-19',
		document: change(oldOakBuild, (d) => {
			d.nodes.push({ id: 'alt3_pos', label: 'Alternator 3 B+', kind: 'alternator' });
			d.alternators.push({
				...structuredClone(d.alternators[0]!),
				id: 'alt3',
				label: 'Alternator 3',
				positive: 'alt3_pos',
			});
			const lead = d.cables.find((c) => c.id === 'charge2')!;
			d.cables.push({
				...structuredClone(lead),
				id: 'charge3',
				label: 'Alternator 3 lead',
				from: 'alt3_pos',
				lengthM: 4.5,
			});
		}),
		parts: [
			{
				item: '320 A high-output alternator, rebuilt',
				quantity: 1,
				unitPrice: 890,
				link: 'quote from the rebuild bench, ref A-320',
			},
			{ item: 'Third-alternator bracket, machined', quantity: 1, unitPrice: 420, link: '' },
			{ item: 'Serpentine belt, longer', quantity: 1, unitPrice: 38.5, link: '' },
			{ item: '2/0 copper, per foot', quantity: 15, unitPrice: 6.2, link: 'catalogue p. 14' },
			{ item: '400 A fuse and holder', quantity: 1, unitPrice: 54, link: '' },
			{ item: '2/0 lugs', quantity: 2, unitPrice: 4.75, link: '' },
		],
	},
	{
		vehicle: 'Old Oak',
		name: 'Two more rear strings and 2/0 amplifier wiring',
		notes:
			'Rear wall has room for two more modules; the 1/0 amplifier leads run warm after long sessions.',
		author: 1,
		on: '2026-10-10',
		document: change(oldOakBuild, (d) => {
			d.banks.find((b) => b.id === 'rear')!.stringsInParallel = 6;
			for (const c of d.cables)
				if (/^amp\d_(feed|gnd)$/.test(c.id)) c.size = { kind: 'awg', awg: '2/0' };
		}),
		parts: [
			{
				item: '5-cell LiFePO4 module, 120 Ah',
				quantity: 2,
				unitPrice: 575,
				link: 'module spec sheet, rev C',
			},
			{ item: '2/0 copper, per foot', quantity: 48, unitPrice: 6.2, link: 'catalogue p. 14' },
			{ item: '2/0 lugs', quantity: 16, unitPrice: 4.75, link: '' },
			{ item: 'Module hold-down strap set', quantity: 2, unitPrice: 32, link: '' },
		],
	},
];
