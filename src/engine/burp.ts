import { amplifierDrawCurrent } from './amplifier';
import { beginCapacitorStep, capacitorBranchA, endCapacitorStep } from './capacitor';
import { compileNetwork } from './network';
import { alternatorCurrent, bankCurrent, isolatorCurrent } from './newton';
import { solveCompiled } from './solver';
import { advanceSoc, capacitorRestVoltages, setBankStates } from './session';
import type { BuildDocument } from './types';

const volt = (v: Float64Array, i: number) => (i < 0 ? 0 : v[i]!);

export interface BurpRun {
	durationS: number;
	stepS: number;
	/** Sample times (s), one per step, starting at the first step's end. */
	timeS: number[];
	/** Lowest amplifier terminal voltage at each step (V). */
	minAmplifierV: number[];
	/** Each bank's terminal voltage at each step (V), by bank id. */
	bankV: Record<string, number[]>;
	/** Lowest terminal voltage each amplifier saw during the run (V). */
	amplifierMinV: Record<string, number>;
	/** Energy into the amplifiers, out of the banks, the alternators and the capacitor banks (Wh). */
	energyWh: {
		amplifiers: number;
		banks: number;
		alternators: number;
		capacitors: number;
		cableLoss: number;
	};
	/**
	 * Each capacitor bank through the burp: its voltage before it (charged at the operating point
	 * at rest), its lowest terminal voltage and its largest discharge current.
	 */
	capacitors: Record<
		string,
		{ startV: number; minV: number; peakA: number; shareFirst100ms: number }
	>;
	/**
	 * Share of the charge the sources (banks, alternators, capacitor banks) delivered in the first
	 * 100 ms that came from the capacitor banks (0..1); null without any.
	 */
	capacitorShareFirst100ms: number | null;
	startSoc: Record<string, number>;
	endSoc: Record<string, number>;
	/** Time (s) at which the system had no operating point any more, or null. */
	collapsedAtS: number | null;
}

/**
 * A burp held for `durationS` at time step `stepS`: at each step the network is solved at burp
 * demand (warm-started from the previous step), then each bank's state of charge moves by its
 * current over the step — discharge counted with the Peukert-effective current
 * I·(I/I_H)^(k−1), charge at face value.
 */
export function runBurp(
	doc: BuildDocument,
	opts: {
		engineRpm: number;
		demand: number;
		conductorTempC: number;
		durationS: number;
		stepS: number;
	},
): BurpRun {
	const steps = Math.max(1, Math.round(opts.durationS / opts.stepS));
	const soc: Record<string, number> = Object.fromEntries(
		doc.banks.map((b) => [b.id, b.stateOfCharge]),
	);
	const startSoc = { ...soc };
	const net = compileNetwork(doc, {
		engineRpm: opts.engineRpm,
		demand: opts.demand,
		conductorTempC: opts.conductorTempC,
	});
	const timeS: number[] = [];
	const minAmplifierV: number[] = [];
	const bankV: Record<string, number[]> = Object.fromEntries(doc.banks.map((b) => [b.id, []]));
	const amplifierMinV: Record<string, number> = Object.fromEntries(
		doc.amplifiers.map((a) => [a.id, Number.POSITIVE_INFINITY]),
	);
	const energyWh = { amplifiers: 0, banks: 0, alternators: 0, capacitors: 0, cableLoss: 0 };
	const caps = net.capacitors;
	const restV = caps.length > 0 ? capacitorRestVoltages(doc, opts) : [];
	caps.forEach((c, k) => (c.vcV = restV[k]!));
	const capacitors = Object.fromEntries(
		caps.map((c) => [c.id, { startV: c.vcV, minV: c.vcV, peakA: 0, shareFirst100ms: 0 }]),
	);
	beginCapacitorStep(caps, opts.stepS);
	// Charge delivered in the first 100 ms: by the capacitor banks, and by every source.
	let earlyCapC = 0;
	let earlyAllC = 0;
	const earlyByCap = new Float64Array(caps.length);
	let warm: Float64Array | undefined;
	let collapsedAtS: number | null = null;
	const { stepS } = opts;
	const bankSeries = doc.banks.map((b) => bankV[b.id]!);
	for (let k = 1; k <= steps; k++) {
		setBankStates(net, doc.banks, soc);
		const raw = solveCompiled(net, warm);
		warm = raw.v;
		const v = raw.v;
		const t = k * stepS;
		timeS.push(t);
		// The step's figures straight from the node voltages, in the order (and with the arithmetic)
		// of a described solution, without building one a step.
		let minV = Number.POSITIVE_INFINITY;
		for (const a of net.amplifiers) {
			const terminalV = volt(v, a.p) - volt(v, a.n);
			const [currentA] = amplifierDrawCurrent(a.draw, terminalV, raw.lambda);
			minV = Math.min(minV, terminalV);
			amplifierMinV[a.id] = Math.min(amplifierMinV[a.id]!, terminalV);
			energyWh.amplifiers += (currentA * terminalV * stepS) / 3600;
		}
		minAmplifierV.push(doc.amplifiers.length ? minV : Number.NaN);
		const early = t <= 0.1 + 1e-9;
		for (const a of net.alternators) {
			const terminalV = volt(v, a.p) - volt(v, a.n);
			const [currentA] = alternatorCurrent(a, terminalV);
			energyWh.alternators += (currentA * terminalV * stepS) / 3600;
			if (early) earlyAllC += Math.max(0, currentA) * stepS;
		}
		caps.forEach((c, k) => {
			const terminalV = volt(v, c.p) - volt(v, c.n);
			const outA = -capacitorBranchA(c, terminalV);
			energyWh.capacitors += (outA * terminalV * stepS) / 3600;
			const seen = capacitors[c.id]!;
			seen.minV = Math.min(seen.minV, terminalV);
			seen.peakA = Math.max(seen.peakA, outA);
			if (early) {
				earlyByCap[k] += Math.max(0, outA) * stepS;
				earlyCapC += Math.max(0, outA) * stepS;
				earlyAllC += Math.max(0, outA) * stepS;
			}
		});
		endCapacitorStep(caps, (k) => volt(v, caps[k]!.p) - volt(v, caps[k]!.n), stepS);
		let cableLossW = 0;
		for (const c of net.cables) {
			const dropV = volt(v, c.p) - volt(v, c.n);
			cableLossW += dropV * c.g * dropV;
		}
		for (const x of net.isolators) {
			const dropV = volt(v, x.p) - volt(v, x.n);
			cableLossW += isolatorCurrent(dropV, x)[0] * dropV;
		}
		energyWh.cableLoss += (cableLossW * stepS) / 3600;
		for (let i = 0; i < net.banks.length; i++) {
			const b = net.banks[i]!;
			const bank = doc.banks[i]!;
			const terminalV = volt(v, b.p) - volt(v, b.n);
			const [currentA] = bankCurrent(b, terminalV);
			bankSeries[i]!.push(terminalV);
			energyWh.banks += (currentA * terminalV * stepS) / 3600;
			if (early) earlyAllC += Math.max(0, currentA) * stepS;
			soc[bank.id] = advanceSoc(bank, soc[bank.id]!, currentA, stepS);
		}
		if (raw.collapsed) {
			collapsedAtS = t;
			break;
		}
	}
	caps.forEach((c, k) => {
		capacitors[c.id]!.shareFirst100ms = earlyAllC > 0 ? earlyByCap[k]! / earlyAllC : 0;
	});
	return {
		durationS: opts.durationS,
		stepS: opts.stepS,
		timeS,
		minAmplifierV,
		bankV,
		amplifierMinV,
		energyWh,
		capacitors,
		capacitorShareFirst100ms: caps.length === 0 ? null : earlyAllC > 0 ? earlyCapC / earlyAllC : 0,
		startSoc,
		endSoc: soc,
		collapsedAtS,
	};
}
