import { shelfSpecOf, type ShelfKind } from '../../src/lib/shelf-kinds';
import { marlinBuild, oldOakBuild, pebbleBuild } from './builds';

/**
 * Invented demo data: what the demo team keeps on its shelf or is eyeing, with invented prices
 * (minor units) and suppliers. Fields come from the demo builds' own parts, changed where noted.
 */
export interface DemoShelfEntry {
	kind: ShelfKind;
	label: string;
	spec: Record<string, unknown>;
	priceMinor: number | null;
	supplier: string;
	owned: number;
	notes: string;
}

const rearBank = marlinBuild.banks.find((b) => b.id === 'rear')!;
const run = oldOakBuild.cables.find((c) => c.id === 'run') ?? oldOakBuild.cables[0]!;

export const DEMO_SHELF: DemoShelfEntry[] = [
	{
		kind: 'banks',
		label: '100 Ah AGM, rear spare',
		spec: shelfSpecOf('banks', { ...rearBank, stringsInParallel: 1 }),
		priceMinor: 27_450,
		supplier: 'Dockside battery counter',
		owned: 1,
		notes: 'Bought with the Marlin rear pair; kept on a maintainer in the trailer.',
	},
	{
		kind: 'banks',
		label: '60 Ah lithium module',
		spec: shelfSpecOf('banks', {
			...pebbleBuild.banks[0]!,
			chemistry: 'lfp',
			cellsPerUnit: 4,
			unitCapacityAh: 60,
			unitResistanceOhm: 0.0022,
		}),
		priceMinor: 58_900,
		supplier: 'Mail order',
		owned: 0,
		notes: 'Eyeing two for Pebble next season.',
	},
	{
		kind: 'alternators',
		label: 'High-output alternator, 280 A',
		spec: shelfSpecOf('alternators', marlinBuild.alternators[0]!),
		priceMinor: 64_000,
		supplier: 'Rebuild shop on Quay Road',
		owned: 0,
		notes: '',
	},
	{
		kind: 'amplifiers',
		label: 'Mono bass amplifier, 2.5 kW',
		spec: shelfSpecOf('amplifiers', marlinBuild.amplifiers[0]!),
		priceMinor: 39_900,
		supplier: '',
		owned: 2,
		notes: 'Both in Marlin.',
	},
	{
		kind: 'cables',
		label: `${run.size.kind === 'awg' ? `${run.size.awg} AWG` : 'Run'} copper, red`,
		spec: shelfSpecOf('cables', { ...run, material: 'copper' }),
		priceMinor: 1_185,
		supplier: 'Marine chandlery',
		owned: 12,
		notes: 'Price per metre; 12 m left on the reel.',
	},
	{
		kind: 'fuses',
		label: '250 A fuse and holder',
		spec: { ratingA: 250, device: 'fuse', contactResistanceOhm: 0.0002 },
		priceMinor: 3_450,
		supplier: '',
		owned: 3,
		notes: '',
	},
	{
		kind: 'isolators',
		label: '500 A relay',
		spec: { kind: 'relay', closedResistanceOhm: 0.0003, forwardDropV: 0 },
		priceMinor: null,
		supplier: '',
		owned: 0,
		notes: 'Price to ask.',
	},
];

/** Invented demo data: the demo team's season, its budget and what was bought in it (minor units). */
export const DEMO_SEASON = {
	name: '2026 season',
	startsOn: '2026-03-01',
	endsOn: '2026-11-30',
	budgetMinor: 450_000,
	purchases: [
		{
			on: '2026-04-11',
			shelf: '100 Ah AGM, rear spare',
			item: '100 Ah AGM, rear spare',
			quantity: 2,
			unitPriceMinor: 27_450,
			payer: 1,
			notes: 'The Marlin rear pair.',
		},
		{
			on: '2026-05-03',
			shelf: null,
			item: 'Terminal lugs and heat-shrink',
			quantity: 1,
			unitPriceMinor: 4_680,
			payer: 0,
			notes: '',
		},
		{
			on: '2026-06-20',
			shelf: '250 A fuse and holder',
			item: '250 A fuse and holder',
			quantity: 3,
			unitPriceMinor: 3_450,
			payer: 0,
			notes: '',
		},
		{
			on: '2026-08-29',
			shelf: null,
			item: 'Alternator rebuild and bearings',
			quantity: 1,
			unitPriceMinor: 18_000,
			payer: 1,
			notes: 'Old Oak, before the finals.',
		},
	],
};
