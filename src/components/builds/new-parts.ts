import {
	alternatorWithDefaults,
	amplifierWithDefaults,
	bankWithDefaults,
	PART_GROUPS,
	partsOf,
} from '@/engine/browser';
import type {
	Alternator,
	Amplifier,
	BatteryBank,
	BuildDocument,
	BuildNode,
	Cable,
	CapacitorBank,
	DcDcCharger,
	Isolator,
	SteadyLoad,
} from '@/engine/browser';

/** An id not yet used in the document: `${prefix}-1`, `${prefix}-2`, … */
export function freshId(doc: BuildDocument, prefix: string): string {
	const used = new Set(
		PART_GROUPS.flatMap((g) => partsOf(doc, g) as Array<{ id: string }>).map((x) => x.id),
	);
	for (let i = 1; ; i++) if (!used.has(`${prefix}-${i}`)) return `${prefix}-${i}`;
}

const firstOf = (doc: BuildDocument, kind: BuildNode['kind']) =>
	doc.nodes.find((n) => n.kind === kind)?.id ?? doc.nodes[0]?.id ?? '';
const chassisOf = (doc: BuildDocument) => firstOf(doc, 'chassis');

export const newNode = (doc: BuildDocument): BuildNode => ({
	id: freshId(doc, 'node'),
	label: 'New block',
	kind: 'block',
});

export const newCable = (doc: BuildDocument): Cable => ({
	id: freshId(doc, 'cable'),
	label: 'New cable',
	from: firstOf(doc, 'battery'),
	to: firstOf(doc, 'block'),
	size: { kind: 'awg', awg: '4' },
	material: 'copper',
	lengthM: 1,
	parallelRuns: 1,
	fuses: [],
	insulationC: 105,
});

export const newBank = (doc: BuildDocument): BatteryBank =>
	bankWithDefaults({
		id: freshId(doc, 'bank'),
		label: 'New bank',
		positive: firstOf(doc, 'battery'),
		negative: chassisOf(doc),
		chemistry: 'agm',
		unitCapacityAh: 100,
		unitResistanceOhm: 0.004,
	});

export const newAlternator = (doc: BuildDocument): Alternator =>
	alternatorWithDefaults({
		id: freshId(doc, 'alt'),
		label: 'New alternator',
		positive: firstOf(doc, 'alternator'),
		negative: chassisOf(doc),
		ratedHotA: 200,
		setPointV: 14.4,
	});

export const newAmplifier = (doc: BuildDocument): Amplifier =>
	amplifierWithDefaults({
		id: freshId(doc, 'amp'),
		label: 'New amplifier',
		positive: firstOf(doc, 'amplifier'),
		negative: chassisOf(doc),
		ratedPowerW: 1000,
	});

export const newLoad = (doc: BuildDocument): SteadyLoad => ({
	id: freshId(doc, 'load'),
	label: 'New load',
	positive: firstOf(doc, 'battery'),
	negative: chassisOf(doc),
	currentA: 10,
});

/**
 * A relay between the starting bank's node and the rear: closed while the engine runs, as a
 * solenoid on the ignition is. Half a milliohm closed is a plain product default, to be edited.
 */
export const newIsolator = (doc: BuildDocument): Isolator => ({
	id: freshId(doc, 'iso'),
	label: 'New relay',
	from: firstOf(doc, 'battery'),
	to: firstOf(doc, 'block'),
	kind: 'relay',
	closes: 'engine_running',
	closedResistanceOhm: 0.0005,
	forwardDropV: 0,
});

/** A capacitor bank of one module on a new node beside the amplifiers (plain product defaults). */
export const newCapacitor = (doc: BuildDocument): CapacitorBank => ({
	id: freshId(doc, 'cap'),
	label: 'New capacitor bank',
	positive: firstOf(doc, 'amplifier'),
	negative: chassisOf(doc),
	moduleFarads: 100,
	moduleEsrOhm: 0.001,
	moduleRatedV: 16,
	moduleLeakageA: 0.005,
	inSeries: 1,
	inParallel: 1,
});

/** A DC-DC charger from the starting bank's node to an auxiliary bank (plain product defaults). */
export const newCharger = (doc: BuildDocument): DcDcCharger => ({
	id: freshId(doc, 'dcdc'),
	label: 'New DC-DC charger',
	from: firstOf(doc, 'battery'),
	to: firstOf(doc, 'block'),
	targetV: 14.4,
	maxOutputA: 40,
	efficiency: 0.9,
	runs: 'engine_running',
});

/** A starting point for a vehicle with no revision yet: one battery, one amplifier, wired. */
export function starterDocument(): BuildDocument {
	return {
		schemaVersion: 1,
		nodes: [
			{ id: 'chassis', label: 'Chassis', kind: 'chassis' },
			{ id: 'batt_pos', label: 'Battery +', kind: 'battery' },
			{ id: 'amp_pos', label: 'Amplifier +', kind: 'amplifier' },
			{ id: 'amp_neg', label: 'Amplifier −', kind: 'amplifier' },
		],
		alternators: [],
		banks: [
			{
				...newBank({
					schemaVersion: 1,
					nodes: [],
					alternators: [],
					banks: [],
					amplifiers: [],
					loads: [],
					cables: [],
				}),
				id: 'battery',
				label: 'Battery',
				positive: 'batt_pos',
				negative: 'chassis',
				location: 'engine_bay',
			},
		],
		amplifiers: [
			amplifierWithDefaults({
				id: 'amp',
				label: 'Amplifier',
				positive: 'amp_pos',
				negative: 'amp_neg',
				ratedPowerW: 1000,
			}),
		],
		loads: [],
		cables: [
			{
				id: 'feed',
				label: 'Amplifier feed',
				from: 'batt_pos',
				to: 'amp_pos',
				size: { kind: 'awg', awg: '4' },
				material: 'copper',
				lengthM: 5,
				parallelRuns: 1,
				fuses: [{ ratingA: 100, end: 'from', distanceM: 0.2 }],
				insulationC: 105,
			},
			{
				id: 'ground',
				label: 'Amplifier ground',
				from: 'amp_neg',
				to: 'chassis',
				size: { kind: 'awg', awg: '4' },
				material: 'copper',
				lengthM: 0.5,
				parallelRuns: 1,
				fuses: [],
				insulationC: 105,
			},
		],
	};
}
