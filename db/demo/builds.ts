/**
 * Build documents of the demo vehicles. Invented for the demo scenario: every figure here is made
 * up to look like a plausible street, mid and extreme build, not taken from any real product.
 */
import {
	alternatorWithDefaults,
	amplifierWithDefaults,
	bankWithDefaults,
} from '../../src/engine/defaults';
import type {
	BuildDocument,
	Cable,
	CableSize,
	Fuse,
	Material,
	SteadyLoad,
} from '../../src/engine/types';

const awg = (size: (CableSize & { kind: 'awg' })['awg']): CableSize => ({ kind: 'awg', awg: size });
const FT = 0.3048;

function cable(
	id: string,
	label: string,
	from: string,
	to: string,
	size: CableSize,
	lengthFt: number,
	opts: Partial<Pick<Cable, 'material' | 'parallelRuns' | 'insulationC'>> & { fuses?: Fuse[] } = {},
): Cable {
	return {
		id,
		label,
		from,
		to,
		size,
		material: opts.material ?? ('copper' satisfies Material),
		lengthM: lengthFt * FT,
		parallelRuns: opts.parallelRuns ?? 1,
		fuses: opts.fuses ?? [],
		insulationC: opts.insulationC ?? 105,
	};
}

const fuse = (ratingA: number, end: Fuse['end'], distanceIn: number): Fuse => ({
	ratingA,
	end,
	distanceM: distanceIn * 0.0254,
});

const bank = bankWithDefaults;
const alternator = alternatorWithDefaults;
const amp = amplifierWithDefaults;

const load = (l: SteadyLoad): SteadyLoad => l;

/** Small street hatchback: stock alternator and its one starting battery; a block in the trunk. */
export const pebbleBuild: BuildDocument = {
	schemaVersion: 1,
	nodes: [
		{ id: 'chassis', label: 'Chassis', kind: 'chassis' },
		{ id: 'engine', label: 'Engine block', kind: 'junction' },
		{ id: 'alt_pos', label: 'Alternator B+', kind: 'alternator' },
		{ id: 'front_pos', label: 'Starting battery +', kind: 'battery' },
		{ id: 'front_neg', label: 'Starting battery −', kind: 'battery' },
		{ id: 'rear_block', label: 'Trunk fuse block', kind: 'block' },
		{ id: 'amp_pos', label: 'Mono amplifier +', kind: 'amplifier' },
		{ id: 'amp_neg', label: 'Mono amplifier −', kind: 'amplifier' },
	],
	alternators: [
		alternator({
			id: 'alt',
			label: 'Stock alternator',
			positive: 'alt_pos',
			negative: 'engine',
			ratedHotA: 105,
			setPointV: 14.3,
			pulleyRatio: 2.7,
		}),
	],
	banks: [
		bank({
			id: 'front',
			label: 'Starting battery',
			positive: 'front_pos',
			negative: 'front_neg',
			chemistry: 'agm',
			unitCapacityAh: 62,
			unitResistanceOhm: 0.0055,
			location: 'engine_bay',
			stateOfCharge: 0.9,
		}),
	],
	amplifiers: [
		amp({
			id: 'mono',
			label: 'Mono amplifier',
			positive: 'amp_pos',
			negative: 'amp_neg',
			ratedPowerW: 1350,
			efficiency: 0.8,
		}),
	],
	loads: [
		load({
			id: 'vehicle',
			label: 'Vehicle electrics',
			positive: 'front_pos',
			negative: 'chassis',
			currentA: 19,
		}),
	],
	cables: [
		cable('charge', 'Alternator charge lead', 'alt_pos', 'front_pos', awg('4'), 3.5, {
			fuses: [fuse(175, 'to', 7)],
		}),
		cable('strap', 'Engine ground strap', 'engine', 'chassis', awg('4'), 1.8),
		cable('front_gnd', 'Starting battery ground', 'front_neg', 'chassis', awg('4'), 1.2),
		cable('run', 'Front-to-rear run', 'front_pos', 'rear_block', awg('4'), 16.5, {
			material: 'cca10',
			fuses: [fuse(125, 'from', 9)],
		}),
		cable('amp_feed', 'Amplifier feed', 'rear_block', 'amp_pos', awg('4'), 2.5, {
			fuses: [fuse(125, 'from', 8)],
		}),
		cable('amp_gnd', 'Amplifier ground', 'amp_neg', 'chassis', awg('4'), 2.5),
	],
};

/** Mid-size sedan: high-output alternator, AGM front and a two-string AGM bank in the trunk, 1/0 runs. */
export const marlinBuild: BuildDocument = {
	schemaVersion: 1,
	nodes: [
		{ id: 'chassis', label: 'Chassis', kind: 'chassis' },
		{ id: 'engine', label: 'Engine block', kind: 'junction' },
		{ id: 'alt_pos', label: 'Alternator B+', kind: 'alternator' },
		{ id: 'front_pos', label: 'Front AGM +', kind: 'battery' },
		{ id: 'front_neg', label: 'Front AGM −', kind: 'battery' },
		{ id: 'rear_pos', label: 'Rear bank +', kind: 'battery' },
		{ id: 'rear_neg', label: 'Rear bank −', kind: 'battery' },
		{ id: 'block', label: 'Distribution block', kind: 'block' },
		{ id: 'sub1_pos', label: 'Bass amplifier A +', kind: 'amplifier' },
		{ id: 'sub1_neg', label: 'Bass amplifier A −', kind: 'amplifier' },
		{ id: 'sub2_pos', label: 'Bass amplifier B +', kind: 'amplifier' },
		{ id: 'sub2_neg', label: 'Bass amplifier B −', kind: 'amplifier' },
		{ id: 'mids_pos', label: 'Four-channel +', kind: 'amplifier' },
		{ id: 'mids_neg', label: 'Four-channel −', kind: 'amplifier' },
	],
	alternators: [
		alternator({
			id: 'alt',
			label: 'High-output alternator',
			positive: 'alt_pos',
			negative: 'engine',
			ratedHotA: 240,
			setPointV: 14.6,
			pulleyRatio: 2.8,
			curveIsCold: true,
			hotFactor: 0.85,
			curve: [
				{ rpm: 1000, currentA: 40 },
				{ rpm: 1800, currentA: 150 },
				{ rpm: 2500, currentA: 215 },
				{ rpm: 4000, currentA: 260 },
				{ rpm: 6000, currentA: 280 },
			],
		}),
	],
	banks: [
		bank({
			id: 'front',
			label: 'Front AGM',
			positive: 'front_pos',
			negative: 'front_neg',
			chemistry: 'agm',
			unitCapacityAh: 90,
			unitResistanceOhm: 0.004,
			location: 'engine_bay',
		}),
		bank({
			id: 'rear',
			label: 'Rear AGM bank',
			positive: 'rear_pos',
			negative: 'rear_neg',
			chemistry: 'agm',
			unitCapacityAh: 100,
			unitResistanceOhm: 0.0035,
			stringsInParallel: 2,
			stateOfCharge: 0.88,
		}),
	],
	amplifiers: [
		amp({
			id: 'sub1',
			label: 'Bass amplifier A',
			positive: 'sub1_pos',
			negative: 'sub1_neg',
			ratedPowerW: 2500,
			efficiency: 0.82,
		}),
		amp({
			id: 'sub2',
			label: 'Bass amplifier B',
			positive: 'sub2_pos',
			negative: 'sub2_neg',
			ratedPowerW: 2500,
			efficiency: 0.82,
		}),
		amp({
			id: 'mids',
			label: 'Four-channel',
			positive: 'mids_pos',
			negative: 'mids_neg',
			ratedPowerW: 600,
			efficiency: 0.7,
		}),
	],
	loads: [
		{
			id: 'vehicle',
			label: 'Vehicle electrics',
			positive: 'front_pos',
			negative: 'chassis',
			currentA: 28,
		},
	],
	cables: [
		cable('charge', 'Alternator charge lead', 'alt_pos', 'front_pos', awg('1/0'), 3, {
			fuses: [fuse(300, 'to', 6)],
		}),
		cable('strap', 'Engine ground strap', 'engine', 'chassis', awg('1/0'), 1.5),
		cable('front_gnd', 'Front AGM ground', 'front_neg', 'chassis', awg('1/0'), 1.5),
		cable('run', 'Front-to-rear run', 'front_pos', 'rear_pos', awg('1/0'), 16, {
			fuses: [fuse(300, 'from', 10), fuse(300, 'to', 10)],
		}),
		cable('rear_gnd', 'Rear bank ground', 'rear_neg', 'chassis', awg('1/0'), 2),
		cable('block_feed', 'Block feed', 'rear_pos', 'block', awg('1/0'), 2, {
			parallelRuns: 2,
			fuses: [fuse(750, 'from', 8)],
		}),
		cable('sub1_feed', 'Bass A feed', 'block', 'sub1_pos', awg('1/0'), 3, {
			fuses: [fuse(300, 'from', 1)],
		}),
		cable('sub2_feed', 'Bass B feed', 'block', 'sub2_pos', awg('1/0'), 3.5, {
			fuses: [fuse(300, 'from', 1)],
		}),
		cable('mids_feed', 'Four-channel feed', 'block', 'mids_pos', awg('8'), 4, {
			fuses: [fuse(80, 'from', 1)],
		}),
		cable('sub1_gnd', 'Bass A ground', 'sub1_neg', 'chassis', awg('1/0'), 2),
		cable('sub2_gnd', 'Bass B ground', 'sub2_neg', 'chassis', awg('1/0'), 2),
		cable('mids_gnd', 'Four-channel ground', 'mids_neg', 'chassis', awg('8'), 2),
	],
};

/** Estate wagon flagship: two alternators on a 16 V LiFePO4 system, 4/0 doubled runs. */
export const oldOakBuild: BuildDocument = {
	schemaVersion: 1,
	nodes: [
		{ id: 'chassis', label: 'Chassis', kind: 'chassis' },
		{ id: 'engine', label: 'Engine block', kind: 'junction' },
		{ id: 'alt1_pos', label: 'Alternator 1 B+', kind: 'alternator' },
		{ id: 'alt2_pos', label: 'Alternator 2 B+', kind: 'alternator' },
		{ id: 'front_pos', label: 'Front bank +', kind: 'battery' },
		{ id: 'front_neg', label: 'Front bank −', kind: 'battery' },
		{ id: 'rear_pos', label: 'Rear wall bank +', kind: 'battery' },
		{ id: 'rear_neg', label: 'Rear wall bank −', kind: 'battery' },
		{ id: 'block_pos', label: 'Main block +', kind: 'block' },
		{ id: 'block_neg', label: 'Main block −', kind: 'block' },
		...[1, 2, 3, 4].flatMap((i) => [
			{ id: `amp${i}_pos`, label: `Amplifier ${i} +`, kind: 'amplifier' as const },
			{ id: `amp${i}_neg`, label: `Amplifier ${i} −`, kind: 'amplifier' as const },
		]),
	],
	alternators: [1, 2].map((i) =>
		alternator({
			id: `alt${i}`,
			label: `Alternator ${i}`,
			positive: `alt${i}_pos`,
			negative: 'engine',
			ratedHotA: 320,
			setPointV: 17.8,
			pulleyRatio: 3.0,
			sourceResistanceOhm: 1.5e-4,
		}),
	),
	banks: [
		bank({
			id: 'front',
			label: 'Front bank',
			positive: 'front_pos',
			negative: 'front_neg',
			chemistry: 'lfp',
			cellsPerUnit: 5,
			unitCapacityAh: 100,
			unitResistanceOhm: 0.0025,
			location: 'engine_bay',
			stateOfCharge: 0.8,
		}),
		bank({
			id: 'rear',
			label: 'Rear wall bank',
			positive: 'rear_pos',
			negative: 'rear_neg',
			chemistry: 'lfp',
			cellsPerUnit: 5,
			unitCapacityAh: 120,
			unitResistanceOhm: 0.0022,
			stringsInParallel: 4,
			stateOfCharge: 0.8,
		}),
	],
	amplifiers: [1, 2, 3, 4].map((i) =>
		amp({
			id: `amp${i}`,
			label: `Amplifier ${i}`,
			positive: `amp${i}_pos`,
			negative: `amp${i}_neg`,
			ratedPowerW: 3000,
			ratedVoltageV: 18,
			efficiency: 0.8,
		}),
	),
	loads: [
		{
			id: 'vehicle',
			label: 'Vehicle electrics',
			positive: 'front_pos',
			negative: 'chassis',
			currentA: 35,
		},
	],
	cables: [
		cable('charge1', 'Alternator 1 lead', 'alt1_pos', 'front_pos', awg('2/0'), 3, {
			fuses: [fuse(400, 'to', 6)],
		}),
		cable('charge2', 'Alternator 2 lead', 'alt2_pos', 'front_pos', awg('2/0'), 4, {
			fuses: [fuse(400, 'to', 6)],
		}),
		cable('strap', 'Engine ground straps', 'engine', 'chassis', awg('4/0'), 1.5, {
			parallelRuns: 2,
		}),
		cable('front_gnd', 'Front bank ground', 'front_neg', 'chassis', awg('2/0'), 1.5),
		cable('run', 'Front-to-rear runs', 'front_pos', 'rear_pos', awg('4/0'), 17, {
			parallelRuns: 2,
			fuses: [fuse(1000, 'from', 12), fuse(1000, 'to', 12)],
		}),
		cable('ground_run', 'Rear-to-front ground runs', 'rear_neg', 'front_neg', awg('4/0'), 17, {
			parallelRuns: 2,
		}),
		cable('rear_gnd', 'Rear bank chassis ground', 'rear_neg', 'chassis', awg('4/0'), 2, {
			parallelRuns: 2,
		}),
		cable('block_feed', 'Block feed', 'rear_pos', 'block_pos', awg('4/0'), 2, {
			parallelRuns: 3,
			fuses: [fuse(1000, 'from', 8)],
		}),
		cable('block_gnd', 'Block ground', 'block_neg', 'rear_neg', awg('4/0'), 2, { parallelRuns: 3 }),
		...[1, 2, 3, 4].flatMap((i) => [
			cable(
				`amp${i}_feed`,
				`Amplifier ${i} feed`,
				'block_pos',
				`amp${i}_pos`,
				awg('1/0'),
				3 + i * 0.5,
				{ fuses: [fuse(350, 'from', 1)] },
			),
			cable(
				`amp${i}_gnd`,
				`Amplifier ${i} ground`,
				`amp${i}_neg`,
				'block_neg',
				awg('1/0'),
				3 + i * 0.5,
			),
		]),
	],
};

export const DEMO_BUILDS: Record<'Pebble' | 'Marlin' | 'Old Oak', BuildDocument> = {
	Pebble: pebbleBuild,
	Marlin: marlinBuild,
	'Old Oak': oldOakBuild,
};

export interface DemoRevision {
	message: string;
	/** Index into DEMO_USERS (db/seed.ts) of the author. */
	author: 0 | 1;
	/** The day, fixed in the demo season (YYYY-MM-DD). */
	on: string;
	document: BuildDocument;
}

function variant(base: BuildDocument, change: (d: BuildDocument) => void): BuildDocument {
	const d = structuredClone(base);
	change(d);
	return d;
}
const withoutPart = <T extends { id: string }>(xs: T[], id: string) =>
	xs.filter((x) => x.id !== id);
const setCable = (d: BuildDocument, id: string, patch: Partial<Cable>) =>
	Object.assign(
		d.cables.find((c) => c.id === id)!,
		patch,
	);

/** Each demo vehicle's history, oldest first; the last entry equals the build above. */
export const DEMO_HISTORIES: Record<keyof typeof DEMO_BUILDS, DemoRevision[]> = {
	Pebble: [
		{
			message: 'First install: 1.35 kW mono off the starting battery, 8 AWG CCA kit wiring',
			author: 1,
			on: '2026-04-11',
			document: variant(pebbleBuild, (d) => {
				for (const id of ['charge', 'strap', 'front_gnd', 'run', 'amp_feed', 'amp_gnd'])
					setCable(d, id, { size: awg('8'), material: 'cca10' });
				setCable(d, 'run', { fuses: [fuse(80, 'from', 10)] });
				setCable(d, 'amp_feed', { fuses: [fuse(80, 'from', 8)] });
				setCable(d, 'charge', { fuses: [] });
			}),
		},
		{
			message: 'Kit wire got warm at the first meet: run, feed and ground to 4 AWG',
			author: 1,
			on: '2026-05-23',
			document: variant(pebbleBuild, (d) => {
				for (const id of ['charge', 'strap', 'front_gnd'])
					setCable(d, id, { size: awg('8'), material: 'cca10' });
				setCable(d, 'charge', { fuses: [] });
				for (const id of ['amp_feed', 'amp_gnd']) setCable(d, id, { material: 'cca10' });
			}),
		},
		{
			message: 'Charge lead and engine strap to 4 AWG copper, fused charge lead at the battery',
			author: 0,
			on: '2026-06-06',
			document: pebbleBuild,
		},
	],
	Marlin: [
		{
			message: 'Two bass amplifiers on the front AGM, 1/0 run to a trunk block',
			author: 0,
			on: '2026-03-07',
			document: variant(marlinBuild, (d) => {
				d.banks = withoutPart(d.banks, 'rear');
				d.cables = withoutPart(
					withoutPart(withoutPart(withoutPart(d.cables, 'rear_gnd'), 'mids_feed'), 'mids_gnd'),
					'block_feed',
				);
				d.amplifiers = withoutPart(d.amplifiers, 'mids');
				d.nodes = d.nodes.filter(
					(n) => !['rear_neg', 'mids_pos', 'mids_neg', 'rear_pos'].includes(n.id),
				);
				setCable(d, 'run', { to: 'block', fuses: [fuse(300, 'from', 10)] });
			}),
		},
		{
			message: 'Second bank: two AGM strings in the trunk, fused at both ends of the run',
			author: 1,
			on: '2026-05-02',
			document: variant(marlinBuild, (d) => {
				d.cables = withoutPart(withoutPart(d.cables, 'mids_feed'), 'mids_gnd');
				d.amplifiers = withoutPart(d.amplifiers, 'mids');
				d.nodes = d.nodes.filter((n) => !['mids_pos', 'mids_neg'].includes(n.id));
			}),
		},
		{
			message: 'Four-channel for the doors, fed from the block',
			author: 1,
			on: '2026-07-11',
			document: marlinBuild,
		},
	],
	'Old Oak': [
		{
			message: 'One alternator, front and rear-wall LiFePO4 banks, doubled 4/0 runs',
			author: 0,
			on: '2026-02-07',
			document: variant(oldOakBuild, (d) => {
				d.alternators = withoutPart(d.alternators, 'alt2');
				d.cables = withoutPart(d.cables, 'charge2');
				d.nodes = d.nodes.filter((n) => n.id !== 'alt2_pos');
				for (const a of d.alternators) a.setPointV = 17.4;
			}),
		},
		{
			message: 'Second alternator on the top bracket',
			author: 1,
			on: '2026-04-22',
			document: variant(oldOakBuild, (d) => {
				for (const a of d.alternators) a.setPointV = 17.4;
			}),
		},
		{
			message: 'Regulators up to 17.8 V so the 5-cell banks reach absorption',
			author: 0,
			on: '2026-08-01',
			document: oldOakBuild,
		},
	],
};
