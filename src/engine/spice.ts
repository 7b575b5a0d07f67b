import { compileNetwork, type CompiledNetwork, type SolveConditions } from './network';
import { solveNetwork } from './solve';
import type { BuildDocument, PartGroup } from './types';

export interface SpiceExport {
	netlist: string;
	/** SPICE node name for each build node id (the chassis is node 0). */
	nodeNames: Record<string, string>;
	/** SPICE device name for each cable id (its current is `@name[i]`). */
	cableDevices: Record<string, string>;
}

const num = (x: number) => x.toPrecision(15);

/**
 * Each kind's SPICE devices by name prefix (device k of a kind is `<prefix><k>`, counting only the
 * parts that conduct under the conditions): the export below writes them, and the compiler names a
 * kind left out here.
 */
export const SPICE_DEVICES = {
	nodes: [],
	alternators: ['balt'],
	banks: ['bbank'],
	amplifiers: ['bamp'],
	loads: ['iload'],
	cables: ['rc'],
	isolators: ['riso', 'biso'],
	capacitors: ['rleak', 'resr', 'ccap'],
	chargers: ['bdcout', 'bdcin'],
} as const satisfies Record<PartGroup, readonly string[]>;

/**
 * The build as a SPICE netlist for a DC operating point (.op): cables as resistors, banks and
 * alternators as behavioural current sources with the engine's piecewise laws, amplifiers as
 * constant-power behavioural loads I = P/V, steady loads as current sources. `nodeset` gives the
 * simulator a starting point (a constant-power load has two solutions; SPICE needs a hint near the
 * high-voltage one).
 */
/**
 * Text safe inside a SPICE comment: every line break, vertical space and other control character
 * becomes a space, so a name can never end the comment and start a netlist line of its own
 * (`.control`, `.include`, a shell escape).
 */
/** Vectors per `print` line (each line stays far below ngspice's line length limit). */
const PRINT_PER_LINE = 40;

export function spiceComment(text: string): string {
	// eslint-disable-next-line no-control-regex -- matching control characters is the point
	return text.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/g, ' ');
}

export function toSpiceNetlist(
	doc: BuildDocument,
	conditions: SolveConditions,
	opts: {
		title?: string;
		nodeset?: Record<string, number> | 'unloaded';
		control?: boolean;
		/**
		 * A transient run instead of an operating point: the burp switched on just after t = 0 (the
		 * operating point at t = 0 is the network at rest, where the capacitor banks charge), then
		 * held for `durationS`; `wrdata` writes every node's voltage over time to `file`.
		 */
		transient?: { durationS: number; stepS: number; file: string };
	} = {},
): SpiceExport {
	const tran = opts.transient;
	/** The burp's demand as a function of time: off at the operating point, on within 1 µs. */
	const onset = tran ? '*min(time*1e6, 1)' : '';
	const nodeset = opts.nodeset === 'unloaded' ? spiceNodesetHint(doc, conditions) : opts.nodeset;
	const net: CompiledNetwork = compileNetwork(doc, conditions);
	const nodeNames: Record<string, string> = {};
	for (const [id, i] of net.index) nodeNames[id] = i < 0 ? '0' : `n${i + 1}`;
	const name = (i: number) => (i < 0 ? '0' : `n${i + 1}`);
	const v = (p: number, n: number) => (n < 0 ? `V(${name(p)})` : `(V(${name(p)})-V(${name(n)}))`);
	const lines: string[] = [`* ${spiceComment(opts.title ?? 'Sagwise build')} — DC operating point`];
	lines.push(
		`* nodes: ${spiceComment(
			Object.entries(nodeNames)
				.map(([id, n]) => `${n}=${id}`)
				.join(' '),
		)}`,
	);
	const cableDevices: Record<string, string> = {};
	net.cables.forEach((c, i) => {
		const dev = `rc${i + 1}`;
		cableDevices[c.id] = dev;
		lines.push(`${dev} ${name(c.p)} ${name(c.n)} ${num(c.resistanceOhm)}`);
	});
	net.banks.forEach((b, i) => {
		// Current into the positive node: (Voc−v)/R either way, charging capped at the acceptance.
		const x = v(b.p, b.n);
		lines.push(
			`bbank${i + 1} ${name(b.n)} ${name(b.p)} I=max((${num(b.ocvV)}-${x})/${num(b.resistanceOhm)}, ${num(-b.chargeAcceptanceA)})`,
		);
	});
	net.alternators.forEach((a, i) => {
		if (a.limitA <= 0) return;
		const x = v(a.p, a.n);
		lines.push(
			`balt${i + 1} ${name(a.n)} ${name(a.p)} I=min(max((${num(a.setPointV)}-${x})/${num(a.resistanceOhm)}, 0), ${num(a.limitA)})`,
		);
	});
	net.amplifiers.forEach((a, i) => {
		if (a.powerW <= 0) return;
		// Constant power up to the rated voltage; above it an unregulated amplifier's draw grows as
		// V² (I = P·V/V_rated²) until its stated maximum (constant power again): max(P/V, min(…)).
		const x = v(a.p, a.n);
		const constant = `${num(a.powerW)}${onset}/${x}`;
		if (!Number.isFinite(a.draw.ratedVoltageV))
			lines.push(`bamp${i + 1} ${name(a.p)} ${name(a.n)} I=${constant}`);
		else {
			const growing = `${num(a.powerW / a.draw.ratedVoltageV ** 2)}${onset}*${x}`;
			const rising = Number.isFinite(a.draw.maxPowerW)
				? `min(${growing}, ${num(a.draw.maxPowerW)}${onset}/${x})`
				: growing;
			lines.push(`bamp${i + 1} ${name(a.p)} ${name(a.n)} I=max(${constant}, ${rising})`);
		}
	});
	net.loads.forEach((l, i) =>
		lines.push(`iload${i + 1} ${name(l.p)} ${name(l.n)} DC ${num(l.currentA)}`),
	);
	// A capacitor bank: its leakage across the terminals; in a transient run the capacitor itself
	// behind its series resistance (an internal node of its own).
	net.capacitors.forEach((c, i) => {
		if (c.gLeak > 0) lines.push(`rleak${i + 1} ${name(c.p)} ${name(c.n)} ${num(1 / c.gLeak)}`);
		if (!tran) return;
		lines.push(
			`resr${i + 1} ${name(c.p)} cap${i + 1} ${num(c.esrOhm)}`,
			`ccap${i + 1} cap${i + 1} ${name(c.n)} ${num(c.farads)}`,
		);
	});
	// A DC-DC charger: its output an alternator-like source toward its target, its input drawing
	// that output's power over the efficiency from its own node (the same expression, so SPICE
	// solves the coupling the engine iterates).
	net.chargers.forEach(({ output, input, efficiency }, i) => {
		if (output.limitA <= 0) return;
		const xo = v(output.p, output.n);
		const out = `min(max((${num(output.setPointV)}-${xo})/${num(output.resistanceOhm)}, 0), ${num(output.limitA)})`;
		lines.push(
			`bdcout${i + 1} ${name(output.n)} ${name(output.p)} I=${out}`,
			`bdcin${i + 1} ${name(input.p)} ${name(input.n)} I=${out}*${xo}/(${num(efficiency)}*${v(input.p, input.n)})`,
		);
	});
	// A closed relay is a resistor; a diode isolator conducts past its drop through its slope
	// resistance: I = max(V − Vf, 0)/R, the engine's piecewise-linear law. An open one is left out.
	net.isolators.forEach((x, i) =>
		lines.push(
			x.diode
				? `biso${i + 1} ${name(x.p)} ${name(x.n)} I=max(${v(x.p, x.n)}-${num(x.dropV)}, 0)*${num(x.g)}`
				: `riso${i + 1} ${name(x.p)} ${name(x.n)} ${num(1 / x.g)}`,
		),
	);
	// The engine's gmin, so both solve the same equations.
	net.nodeIds.forEach((_, i) => lines.push(`rgmin${i + 1} ${name(i)} 0 1e9`));
	if (nodeset && Object.keys(nodeset).length > 0) {
		lines.push(
			`.nodeset ${Object.entries(nodeset)
				.filter(([id]) => nodeNames[id] !== '0')
				.map(([id, x]) => `v(${nodeNames[id]})=${num(x)}`)
				.join(' ')}`,
		);
	}
	lines.push('.options reltol=1e-9 vntol=1e-12 abstol=1e-9 gmin=1e-15 itl1=500');
	if (tran) {
		lines.push(
			'.control',
			'set numdgt=15',
			'set wr_singlescale',
			'set wr_vecnames',
			`tran ${num(tran.stepS)} ${num(tran.durationS)} 0 ${num(tran.stepS)}`,
			`wrdata ${tran.file} ${net.nodeIds.map((_, i) => `v(${name(i)})`).join(' ')}`,
			'.endc',
		);
	} else if (opts.control !== false) {
		lines.push('.control', 'set numdgt=15', 'op');
		const vec = [
			...net.nodeIds.map((_, i) => `v(${name(i)})`),
			...Object.values(cableDevices).map((d) => `@${d}[i]`),
		];
		// ngspice reads a control line into a fixed buffer: a print of a large network is split.
		for (let i = 0; i < vec.length; i += PRINT_PER_LINE)
			lines.push(`print ${vec.slice(i, i + PRINT_PER_LINE).join(' ')}`);
		lines.push('.endc');
	} else {
		lines.push('.op');
	}
	lines.push('.end', '');
	return { netlist: lines.join('\n'), nodeNames, cableDevices };
}

/**
 * A starting point for SPICE near the high-voltage solution: the node voltages of the same network
 * with no amplifier demand (positive side near the source voltages, ground side near 0 V).
 */
export function spiceNodesetHint(
	doc: BuildDocument,
	conditions: SolveConditions,
): Record<string, number> {
	return solveNetwork(doc, { ...conditions, demand: 0 }).nodeVoltages;
}
