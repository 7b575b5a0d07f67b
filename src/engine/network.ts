import { type AmplifierDraw, amplifierDraw } from './amplifier';
import { alternatorLimitA } from './alternator';
import { bankThevenin, chargeAcceptanceA } from './battery';
import { compileCapacitor, type CompiledCapacitor } from './capacitor';
import { cableResistanceOhm } from './conductors';
import { EngineInputError } from './errors';
import { DenseSystem } from './linear';
import { SparseLdl, type SymmetricSystem } from './sparse';
import { partsOf } from './part-kinds';
import type { BuildDocument, Isolator, PartGroup } from './types';

/** A tiny conductance from every node to the chassis (as SPICE's gmin) keeps the matrix regular. */
export const GMIN_S = 1e-9;
export interface SolveConditions {
	/** Engine speed (rpm); 0 = engine off. */
	engineRpm: number;
	/** Fraction of rated power every amplifier draws (1 = burp). */
	demand: number;
	/** Conductor temperature for cable resistance (°C). */
	conductorTempC: number;
	/** Per-bank state of charge, overriding the document (used by the time-stepped burp). */
	stateOfCharge?: Readonly<Record<string, number>>;
}

export interface TwoTerminal {
	p: number; // node index, -1 = chassis
	n: number;
	/** Slots of the element's Jacobian entries (p,p), (n,n) and (p,n); -1 where a terminal is the chassis. */
	spp: number;
	snn: number;
	spn: number;
}

/** Buffers one network's solves reuse (Newton iterations, time steps): allocated once. */
interface Workspace {
	f: Float64Array;
	step: Float64Array;
	trial: Float64Array;
	/** Each bank's and alternator's operating mode at the last assembly, and at the last factorisation. */
	modes: Int8Array;
	factoredModes: Int8Array;
	/** Lowest amplifier terminal voltage seen; non-positive means no physical solution here. */
	minAmpV: number;
}

/** The network reduced to numbers: node indices and per-element parameters. */
export interface CompiledNetwork {
	nodeIds: string[];
	index: Map<string, number>;
	cables: Array<TwoTerminal & { id: string; g: number; resistanceOhm: number }>;
	banks: Array<
		TwoTerminal & {
			id: string;
			ocvV: number;
			resistanceOhm: number;
			chargeResistanceOhm: number;
			chargeAcceptanceA: number;
		}
	>;
	alternators: Array<
		TwoTerminal & { id: string; setPointV: number; resistanceOhm: number; limitA: number }
	>;
	/** `powerW` is the input power at and below the rated voltage; `draw` how it grows above. */
	amplifiers: Array<TwoTerminal & { id: string; powerW: number; draw: AmplifierDraw }>;
	loads: Array<TwoTerminal & { id: string; currentA: number }>;
	/**
	 * Relays and isolators that conduct under these conditions (an open one joins nothing): a
	 * conductance `g`, and for a diode a forward drop below which it carries nothing.
	 */
	isolators: Array<TwoTerminal & { id: string; g: number; dropV: number; diode: boolean }>;
	/** Capacitor banks: open but for their leakage at a steady point; companion branches in a step. */
	capacitors: Array<TwoTerminal & CompiledCapacitor>;
	/**
	 * DC-DC chargers: the output a source toward its target up to its limit (as an alternator is;
	 * limit 0 while it does not run), the input a constant-power draw of the output power over the
	 * efficiency, settled by `solveCompiled`'s outer iteration.
	 */
	chargers: Array<{
		id: string;
		efficiency: number;
		output: TwoTerminal & { id: string; setPointV: number; resistanceOhm: number; limitA: number };
		input: TwoTerminal & { powerW: number; draw: AmplifierDraw };
	}>;
	/** Every isolator's id and node indices (from, to), open ones too: what results report. */
	isolatorIds: string[];
	isolatorEnds: Array<readonly [number, number]>;
	/** Highest source voltage: the scale for initial guesses and collapse checks. */
	nominalV: number;
	/** The nodal Jacobian's pattern and factorisation, made once per network. */
	system: SymmetricSystem;
	/** Slot of each node's diagonal entry. */
	diagSlot: Int32Array;
	work: Workspace;
}

/**
 * Where each kind of part goes in the compiled network, one entry per part of the document in its
 * order (nodes are the unknowns, not elements): `compileNetwork` below fills each list, and the
 * compiler names a kind left out here.
 */
export const COMPILED_LIST = {
	nodes: null,
	alternators: 'alternators',
	banks: 'banks',
	amplifiers: 'amplifiers',
	loads: 'loads',
	cables: 'cables',
	isolators: 'isolatorIds',
	capacitors: 'capacitors',
	chargers: 'chargers',
} as const satisfies Record<PartGroup, keyof CompiledNetwork | null>;

/**
 * Reduces a build to numbers for the solver. `linear: 'dense'` holds the Jacobian dense (the
 * reference the sparse factorisation is tested against); the default is sparse LDLᵀ with a
 * minimum-degree order.
 */
export function compileNetwork(
	doc: BuildDocument,
	conditions: SolveConditions,
	opts: { linear?: 'sparse' | 'dense' } = {},
): CompiledNetwork {
	const chassis = doc.nodes.find((n) => n.kind === 'chassis');
	const nodeIds = doc.nodes.filter((n) => n !== chassis).map((n) => n.id);
	const index = new Map(nodeIds.map((id, i) => [id, i]));
	if (chassis) index.set(chassis.id, -1);
	const at = (id: string, path: string) => {
		const i = index.get(id);
		if (i === undefined) throw new EngineInputError([{ path, message: `No node named "${id}"` }]);
		return i;
	};
	const banks = doc.banks.map((b, k) => {
		const soc = conditions.stateOfCharge?.[b.id] ?? b.stateOfCharge;
		const th = bankThevenin(b, soc);
		const acceptA = chargeAcceptanceA(b, soc);
		return {
			id: b.id,
			p: at(b.positive, `banks.${k}.positive`),
			n: at(b.negative, `banks.${k}.negative`),
			...NO_SLOTS,
			ocvV: th.ocvV,
			resistanceOhm: th.resistanceOhm,
			// A charging bank presents its own internal resistance (one Thevenin source and resistance
			// whichever way the current flows); its charge acceptance is a limit on the current, not a
			// steeper slope, so two banks at different states of charge exchange the Millman current
			// their resistances allow, up to what the charging one accepts.
			chargeResistanceOhm: th.resistanceOhm,
			chargeAcceptanceA: acceptA,
		};
	});
	const alternators = doc.alternators.map((a, k) => ({
		id: a.id,
		p: at(a.positive, `alternators.${k}.positive`),
		n: at(a.negative, `alternators.${k}.negative`),
		...NO_SLOTS,
		setPointV: a.setPointV,
		resistanceOhm: a.sourceResistanceOhm,
		limitA: alternatorLimitA(a, conditions.engineRpm),
	}));
	const nominalV = Math.max(
		1,
		...banks.map((b) => b.ocvV),
		...alternators.filter((a) => a.limitA > 0).map((a) => a.setPointV),
	);
	const cables = doc.cables.map((c, k) => {
		const r = cableResistanceOhm(c, conditions.conductorTempC);
		return {
			id: c.id,
			p: at(c.from, `cables.${k}.from`),
			n: at(c.to, `cables.${k}.to`),
			g: 1 / r,
			resistanceOhm: r,
			...NO_SLOTS,
		};
	});
	const amplifiers = doc.amplifiers.map((a, k) => {
		const draw = amplifierDraw(a, conditions.demand);
		const terminals = {
			p: at(a.positive, `amplifiers.${k}.positive`),
			n: at(a.negative, `amplifiers.${k}.negative`),
			...NO_SLOTS,
		};
		return { id: a.id, ...terminals, powerW: draw.powerW, draw };
	});
	const loads = doc.loads.map((l, k) => ({
		id: l.id,
		p: at(l.positive, `loads.${k}.positive`),
		n: at(l.negative, `loads.${k}.negative`),
		currentA: l.currentA,
		...NO_SLOTS,
	}));
	const allIsolators = partsOf(doc, 'isolators');
	const isolatorEnds = allIsolators.map(
		(x, k) => [at(x.from, `isolators.${k}.from`), at(x.to, `isolators.${k}.to`)] as const,
	);
	const isolators = allIsolators.flatMap((x, k) =>
		conducts(x, conditions.engineRpm)
			? [
					{
						id: x.id,
						p: isolatorEnds[k]![0],
						n: isolatorEnds[k]![1],
						...NO_SLOTS,
						g: 1 / x.closedResistanceOhm,
						dropV: x.kind === 'diode' ? x.forwardDropV : 0,
						diode: x.kind === 'diode',
					},
				]
			: [],
	);
	const capacitors = partsOf(doc, 'capacitors').map((c, k) => ({
		...compileCapacitor(c),
		p: at(c.positive, `capacitors.${k}.positive`),
		n: at(c.negative, `capacitors.${k}.negative`),
		...NO_SLOTS,
	}));
	const chassisIndex = -1;
	const chargers = partsOf(doc, 'chargers').map((c, k) => ({
		id: c.id,
		efficiency: c.efficiency,
		output: {
			id: c.id,
			p: at(c.to, `chargers.${k}.to`),
			n: chassisIndex,
			...NO_SLOTS,
			setPointV: c.targetV,
			resistanceOhm: CHARGER_SOURCE_OHM,
			limitA: conducts({ closes: c.runs }, conditions.engineRpm) ? c.maxOutputA : 0,
		},
		input: {
			p: at(c.from, `chargers.${k}.from`),
			n: chassisIndex,
			...NO_SLOTS,
			powerW: 0,
			draw: { powerW: 0, ratedVoltageV: Infinity, maxPowerW: Infinity },
		},
	}));
	const elements: TwoTerminal[] = [
		...chargers.flatMap((c) => [c.output, c.input]),
		...capacitors,
		...cables,
		...banks,
		...alternators,
		...amplifiers,
		...loads,
		...isolators,
	];
	const n = nodeIds.length;
	const system: SymmetricSystem =
		opts.linear === 'dense'
			? new DenseSystem(n)
			: new SparseLdl(
					n,
					elements.map((e) => [e.p, e.n] as const),
				);
	for (const e of elements) {
		e.spp = system.slot(e.p, e.p);
		e.snn = system.slot(e.n, e.n);
		e.spn = e.p === e.n ? -1 : system.slot(e.p, e.n);
	}
	const modeCount = banks.length + alternators.length + isolators.length + chargers.length;
	return {
		nodeIds,
		index,
		cables,
		banks,
		alternators,
		amplifiers,
		loads,
		isolators,
		capacitors,
		chargers,
		isolatorIds: allIsolators.map((x) => x.id),
		isolatorEnds,
		nominalV,
		system,
		diagSlot: Int32Array.from({ length: n }, (_, i) => system.slot(i, i)),
		work: {
			f: new Float64Array(n),
			step: new Float64Array(n),
			trial: new Float64Array(n),
			modes: new Int8Array(modeCount),
			factoredModes: new Int8Array(modeCount),
			minAmpV: 0,
		},
	};
}

const NO_SLOTS = { spp: -1, snn: -1, spn: -1 };

/** A DC-DC charger's output stiffness in voltage mode (Ω): small, as a regulator's. */
export const CHARGER_SOURCE_OHM = 0.001;

/** Whether a relay or isolator is closed at this engine speed (0 = engine off). */
export function conducts(x: Pick<Isolator, 'closes'>, engineRpm: number): boolean {
	return x.closes === 'always' || (x.closes === 'engine_running' && engineRpm > 0);
}
