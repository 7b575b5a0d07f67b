/** Small builders for test networks, and a seeded generator of random vehicle-like networks. */
import type {
	Alternator,
	Amplifier,
	BatteryBank,
	BuildDocument,
	BuildNode,
	Cable,
	CableSize,
	CapacitorBank,
	DcDcCharger,
	Isolator,
	SteadyLoad,
} from '../../src/engine/types';
import { AWG_SIZES, MATERIALS } from '../../src/engine/types';
import { amplifierWithDefaults, bankWithDefaults } from '../../src/engine/defaults';

export const node = (id: string, kind: BuildNode['kind'] = 'junction'): BuildNode => ({
	id,
	label: id,
	kind,
});

export function bank(
	id: string,
	positive: string,
	negative: string,
	over: Partial<BatteryBank> = {},
): BatteryBank {
	return bankWithDefaults({
		id,
		label: id,
		positive,
		negative,
		chemistry: 'agm',
		unitCapacityAh: 100,
		unitResistanceOhm: 0.005,
		stateOfCharge: 0.875, // AGM table: 12.7 V rested
		...over,
	});
}

/** An alternator with a flat output limit (A) at any speed. */
export function alternator(
	id: string,
	positive: string,
	negative: string,
	limitA: number,
	over: Partial<Alternator> = {},
): Alternator {
	return {
		id,
		label: id,
		positive,
		negative,
		ratedHotA: limitA,
		curve: [{ rpm: 0, currentA: limitA }],
		curveIsCold: false,
		hotFactor: 1,
		pulleyRatio: 1,
		setPointV: 14.4,
		sourceResistanceOhm: 1e-4,
		...over,
	};
}

/** A constant-power load of `inputW` at demand 1 (efficiency 1, so input = rated). */
export function amp(
	id: string,
	positive: string,
	negative: string,
	inputW: number,
	over: Partial<Amplifier> = {},
): Amplifier {
	return amplifierWithDefaults({
		id,
		label: id,
		positive,
		negative,
		ratedPowerW: inputW,
		efficiency: 1,
		...over,
	});
}

export const steady = (
	id: string,
	positive: string,
	negative: string,
	currentA: number,
): SteadyLoad => ({ id, label: id, positive, negative, currentA });

export function cable(
	id: string,
	from: string,
	to: string,
	size: CableSize,
	lengthM: number,
	over: Partial<Cable> = {},
): Cable {
	return {
		id,
		label: id,
		from,
		to,
		size,
		material: 'copper',
		lengthM,
		parallelRuns: 1,
		fuses: [],
		insulationC: 105,
		...over,
	};
}

export function doc(parts: Partial<BuildDocument> & { nodes: BuildNode[] }): BuildDocument {
	return {
		schemaVersion: 1,
		alternators: [],
		banks: [],
		amplifiers: [],
		loads: [],
		cables: [],
		...parts,
	};
}

/** mulberry32: a tiny deterministic PRNG so generated networks are reproducible by seed. */
export function rng(seed: number) {
	let a = seed >>> 0;
	const next = () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
	return {
		next,
		between: (lo: number, hi: number) => lo + (hi - lo) * next(),
		int: (lo: number, hi: number) => Math.floor(lo + (hi - lo + 1) * next()),
		pick: <T>(xs: readonly T[]): T => xs[Math.floor(next() * xs.length)]!,
	};
}

export interface RandomNetworkOptions {
	/** Engine off and identical banks: every bank discharges. */
	banksOnly?: boolean;
	maxAmps?: number;
}

/**
 * A vehicle-like random network: an alternator and a front bank at the engine bay, a chain of
 * distribution blocks toward the rear with more banks on the way, amplifiers hanging off the
 * blocks, every negative returned to the chassis by its own ground cable, sometimes a ground
 * run back to a block ground and a cross-link making a mesh. Loads stay well inside what the
 * sources deliver so a stable operating point exists.
 */
export function randomNetwork(seed: number, opts: RandomNetworkOptions = {}): BuildDocument {
	const r = rng(seed);
	const nodes: BuildNode[] = [node('chassis', 'chassis')];
	const banks: BatteryBank[] = [];
	const alternators: Alternator[] = [];
	const amplifiers: Amplifier[] = [];
	const loads: SteadyLoad[] = [];
	const cables: Cable[] = [];
	const size = (): CableSize =>
		r.next() < 0.8
			? { kind: 'awg', awg: r.pick(AWG_SIZES.slice(2)) }
			: { kind: 'mm2', mm2: r.pick([16, 25, 35, 50, 70, 95]) };
	const material = () => (r.next() < 0.7 ? 'copper' : r.pick(MATERIALS));
	let k = 0;
	const addCable = (from: string, to: string, lo = 0.3, hi = 6) =>
		cables.push(
			cable(`c${++k}`, from, to, size(), r.between(lo, hi), {
				material: material(),
				parallelRuns: r.next() < 0.2 ? 2 : 1,
			}),
		);
	const soc = opts.banksOnly ? 0.8 : undefined;
	const chemistry = opts.banksOnly ? 'agm' : r.pick(['agm', 'flooded', 'lfp'] as const);
	const bankOver = (): Partial<BatteryBank> => ({
		chemistry,
		cellsPerUnit: chemistry === 'lfp' ? 4 : 6,
		stateOfCharge: soc ?? r.between(0.4, 0.95),
		unitResistanceOhm: r.between(0.002, 0.008),
		stringsInParallel: r.int(1, 3),
	});

	nodes.push(node('front_pos', 'battery'), node('front_neg', 'battery'));
	banks.push(bank('front', 'front_pos', 'front_neg', bankOver()));
	addCable('front_neg', 'chassis', 0.3, 1);
	if (!opts.banksOnly) {
		nodes.push(node('alt_pos', 'alternator'), node('engine'));
		alternators.push(
			alternator('alt', 'alt_pos', 'engine', r.between(80, 350), {
				setPointV: r.between(13.8, 14.6),
				sourceResistanceOhm: r.between(5e-5, 5e-4),
			}),
		);
		addCable('alt_pos', 'front_pos', 0.5, 1.5);
		addCable('engine', 'chassis', 0.3, 1);
		if (r.next() < 0.5) loads.push(steady('vehicle', 'front_pos', 'chassis', r.between(10, 40)));
	}
	const blocks = r.int(1, 4);
	let prev = 'front_pos';
	let totalW = 0;
	let ampCount = 0;
	for (let b = 1; b <= blocks; b++) {
		const blk = `blk${b}`;
		nodes.push(node(blk, 'block'));
		addCable(prev, blk, 1, 6);
		if (r.next() < 0.5) {
			nodes.push(node(`b${b}_pos`, 'battery'), node(`b${b}_neg`, 'battery'));
			banks.push(bank(`bank${b}`, `b${b}_pos`, `b${b}_neg`, bankOver()));
			addCable(`b${b}_pos`, blk, 0.3, 1.5);
			addCable(`b${b}_neg`, 'chassis', 0.3, 1.5);
		}
		const amps = r.int(0, 2);
		for (let a = 0; a < amps && ampCount < (opts.maxAmps ?? 8); a++) {
			ampCount++;
			const id = `amp${ampCount}`;
			nodes.push(node(`${id}_pos`, 'amplifier'), node(`${id}_neg`, 'amplifier'));
			const w = r.between(100, 1500);
			totalW += w;
			amplifiers.push(
				amp(id, `${id}_pos`, `${id}_neg`, w, { efficiency: r.between(0.6, 0.95), ratedPowerW: w }),
			);
			// Feeds sized roughly to the amplifier, as a builder would: no 8 AWG on a 1.5 kW amplifier.
			const feed: CableSize = {
				kind: 'awg',
				awg: w > 800 ? r.pick(['4', '2', '1/0'] as const) : r.pick(['8', '6', '4'] as const),
			};
			cables.push(cable(`c${++k}`, blk, `${id}_pos`, feed, r.between(0.3, 2)));
			cables.push(cable(`c${++k}`, `${id}_neg`, 'chassis', feed, r.between(0.3, 2)));
		}
		prev = blk;
	}
	if (blocks >= 3 && r.next() < 0.5) addCable('front_pos', `blk${blocks}`, 3, 6); // a second run: the network becomes a mesh
	if (amplifiers.length === 0) {
		nodes.push(node('amp1_pos', 'amplifier'), node('amp1_neg', 'amplifier'));
		amplifiers.push(amp('amp1', 'amp1_pos', 'amp1_neg', 400));
		addCable(prev, 'amp1_pos', 0.3, 2);
		addCable('amp1_neg', 'chassis', 0.3, 2);
		totalW += 400;
	}
	// Keep the demand well inside what the sources can give (about 2 kW per bank string and the
	// alternator's output at 13 V), so that a stable operating point exists.
	const capacityW =
		banks.reduce((s, b) => s + 2000 * b.stringsInParallel, 0) +
		alternators.reduce((s, a) => s + 13 * a.ratedHotA, 0);
	const inputW = amplifiers.reduce((s, a) => s + a.ratedPowerW / a.efficiency, 0);
	if (inputW > 0.6 * capacityW) {
		const k = (0.6 * capacityW) / inputW;
		for (const a of amplifiers) a.ratedPowerW *= k;
	}
	void totalW;
	return { schemaVersion: 1, nodes, banks, alternators, amplifiers, loads, cables };
}

/**
 * The document with one more bank, a copy of its last, joined to that bank's positive by a cable
 * with no fuse at either battery end (and grounded likewise): by the fusing rule (common practice,
 * no published source) a danger finding the original does not have.
 */
export function withUnfusedBank(d: BuildDocument): BuildDocument {
	const bank = d.banks[d.banks.length - 1]!;
	const template = d.cables[0]!;
	return {
		...d,
		nodes: [...d.nodes, node('extra_pos', 'battery'), node('extra_neg', 'battery')],
		banks: [
			...d.banks,
			{ ...bank, id: 'extra', label: 'Extra bank', positive: 'extra_pos', negative: 'extra_neg' },
		],
		cables: [
			...d.cables,
			{
				...template,
				id: 'extra_link',
				label: 'Extra bank link',
				from: 'extra_pos',
				to: bank.positive,
				fuses: [],
			},
			{
				...template,
				id: 'extra_gnd',
				label: 'Extra bank ground',
				from: 'extra_neg',
				to: 'chassis',
				fuses: [],
			},
		],
	};
}

/**
 * The document with an isolated rear side: a new node carrying a bank of its own (a copy of the
 * first) and a steady load, joined to the first bank's positive by a relay or a diode isolator.
 */
export function withIsolatedRear(
	d: BuildDocument,
	iso: Pick<Isolator, 'kind' | 'closes' | 'closedResistanceOhm' | 'forwardDropV'>,
	rearLoadA = 20,
): BuildDocument {
	const first = d.banks[0]!;
	return {
		...d,
		nodes: [...d.nodes, node('rear_pos', 'battery')],
		banks: [...d.banks, { ...first, id: 'rear', label: 'Rear bank', positive: 'rear_pos' }],
		loads: [...d.loads, steady('rear_load', 'rear_pos', first.negative, rearLoadA)],
		isolators: [
			...(d.isolators ?? []),
			{ id: 'iso', label: 'Rear isolator', from: first.positive, to: 'rear_pos', ...iso },
		],
	};
}

/** The document with a capacitor bank across its first amplifier's terminals. */
export function withCapacitorBank(
	d: BuildDocument,
	over: Partial<CapacitorBank> = {},
): BuildDocument {
	const amp = d.amplifiers[0]!;
	return {
		...d,
		capacitors: [
			...(d.capacitors ?? []),
			{
				id: 'cap',
				label: 'Capacitor bank',
				positive: amp.positive,
				negative: amp.negative,
				moduleFarads: 500,
				moduleEsrOhm: 0.0008,
				moduleRatedV: 2.7,
				moduleLeakageA: 0.003,
				inSeries: 6,
				inParallel: 1,
				...over,
			},
		],
	};
}

/**
 * The document with an auxiliary bank (a copy of the first, at `auxSoc`) on a node of its own,
 * charged from the first bank's positive by a DC-DC charger, and a steady load on it.
 */
export function withCharger(
	d: BuildDocument,
	charger: Partial<DcDcCharger> = {},
	auxSoc = 0.4,
	auxLoadA = 5,
): BuildDocument {
	const first = d.banks[0]!;
	return {
		...d,
		nodes: [...d.nodes, node('aux_pos', 'battery')],
		banks: [
			...d.banks,
			{ ...first, id: 'aux', label: 'Auxiliary bank', positive: 'aux_pos', stateOfCharge: auxSoc },
		],
		loads: [...d.loads, steady('aux_load', 'aux_pos', first.negative, auxLoadA)],
		chargers: [
			...(d.chargers ?? []),
			{
				id: 'dcdc',
				label: 'Charger',
				from: first.positive,
				to: 'aux_pos',
				targetV: 14.2,
				maxOutputA: 30,
				efficiency: 0.88,
				runs: 'always',
				...charger,
			},
		],
	};
}
