import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { DEMO_BUILDS } from '../../db/demo/builds';
import { solveNetwork } from '../../src/engine/solve';
import { toSpiceNetlist } from '../../src/engine/spice';
import type { BuildDocument } from '../../src/engine/types';
import { syntheticNetwork } from '../bench/fixtures';
import {
	randomNetwork,
	rng,
	withCapacitorBank,
	withCharger,
	withIsolatedRear,
} from '../helpers/networks';
import { runBurp } from '../../src/engine/burp';
import { readFileSync } from 'node:fs';

// Cross-check against a general-purpose circuit simulator: Debian's ngspice solves the DC
// operating point of the same netlist the engine exports.
const NGSPICE = process.env.NGSPICE ?? 'ngspice';
const available = spawnSync(NGSPICE, ['--version'], { encoding: 'utf8' }).status === 0;
const dir = mkdtempSync(path.join(tmpdir(), 'sagwise-spice-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function runNgspice(netlist: string, name: string): Map<string, number> {
	const file = path.join(dir, `${name}.cir`);
	writeFileSync(file, netlist);
	const out = spawnSync(NGSPICE, ['-b', file], { encoding: 'utf8', timeout: 30_000 });
	// ngspice -b exits 1 after a .control block even when it ran; judge by what it printed.
	if (out.error || /error/i.test(out.stderr.replace(/No "\.plot".*$/gm, '')))
		throw new Error(`ngspice failed on ${name}: ${out.stderr}`);
	const values = new Map<string, number>();
	for (const line of out.stdout.split('\n')) {
		const m = /^(\S+) = (\S+)$/.exec(line.trim());
		if (m) values.set(m[1]!.toLowerCase(), Number(m[2]));
	}
	return values;
}

const close = (engine: number, spice: number, scale: number) =>
	Math.abs(engine - spice) <= 1e-4 * Math.max(Math.abs(spice), scale);

function compare(
	doc: BuildDocument,
	name: string,
	conditions: { engineRpm: number; demand: number; conductorTempC: number },
) {
	const s = solveNetwork(doc, conditions);
	expect(s.status, `${name} should have an operating point`).toBe('ok');
	// A constant-power load has a second, low-voltage solution, and SPICE needs a hint to stay off
	// it. First the unloaded network's voltages; if ngspice lands elsewhere or gives up, the
	// engine's voltages rounded to 0.1 V. Either way ngspice solves its own equations to 1e-9 from
	// the hint, so an agreement is not inherited from it.
	const hints: Array<Record<string, number> | 'unloaded'> = [
		'unloaded',
		Object.fromEntries(
			Object.entries(s.nodeVoltages).map(([id, v]) => [id, Math.round(v * 10) / 10]),
		),
		// Sources at a kink with milliohm stiffness (a charger's output at its limit beside a bank)
		// can leave SPICE's Newton short of convergence from 0.1 V away: 10 mV away still leaves
		// it its own equations to solve, to 1e-9.
		Object.fromEntries(
			Object.entries(s.nodeVoltages).map(([id, v]) => [id, Math.round(v * 100) / 100]),
		),
	];
	let mismatches: string[] = [];
	for (const [attempt, nodeset] of hints.entries()) {
		const ex = toSpiceNetlist(doc, conditions, { title: name, nodeset });
		let spice: Map<string, number>;
		try {
			spice = runNgspice(ex.netlist, `${name}_${attempt}`);
		} catch (error) {
			mismatches = [String(error)];
			continue;
		}
		mismatches = [];
		let checked = 0;
		for (const [id, spiceNode] of Object.entries(ex.nodeNames)) {
			if (spiceNode === '0') continue;
			const sv = spice.get(`v(${spiceNode})`);
			// Voltages: 1e-4 relative, with 1 mV as the floor for ground-side nodes near 0 V.
			if (sv === undefined || !close(s.nodeVoltages[id]!, sv, 1e-3))
				mismatches.push(`node ${id}: engine ${s.nodeVoltages[id]} vs ngspice ${sv}`);
			checked++;
		}
		doc.cables.forEach((c, i) => {
			const si = spice.get(`@${ex.cableDevices[c.id]}[i]`);
			// Currents: 1e-4 relative, with 0.1 A as the floor for nearly idle cables.
			if (si === undefined || !close(s.cables[i]!.currentA, si, 0.1))
				mismatches.push(`cable ${c.id}: engine ${s.cables[i]!.currentA} vs ngspice ${si}`);
			checked++;
		});
		if (mismatches.length === 0) return checked;
	}
	expect(mismatches, `${name}: engine and ngspice disagree`).toEqual([]);
	return 0;
}

describe.runIf(available)('engine against ngspice', () => {
	it.each(
		Object.entries(DEMO_BUILDS).flatMap(([name, doc]) =>
			[1, 1 / 8].map((demand) => [name, demand, doc] as const),
		),
	)('agrees on the demo build %s at demand %f', (name, demand, doc) => {
		expect(
			compare(doc, `${name.replace(/\W/g, '_')}_${demand}`, {
				engineRpm: 1500,
				demand,
				conductorTempC: 25,
			}),
		).toBeGreaterThan(10);
	});

	it('agrees on 60 generated networks (burp and music, engine running and off)', () => {
		let compared = 0;
		for (let k = 1; k <= 60; k++) {
			const doc = randomNetwork(1000 + k * 37, { banksOnly: k % 4 === 0 });
			const conditions = {
				engineRpm: k % 3 === 0 ? 900 : 2200,
				demand: k % 2 === 0 ? 1 : 1 / 8,
				conductorTempC: 20 + (k % 5) * 10,
			};
			if (solveNetwork(doc, conditions).status !== 'ok') continue; // a genuine collapse has no operating point to compare
			compare(doc, `gen_${k}`, conditions);
			compared++;
		}
		expect(compared).toBeGreaterThanOrEqual(50);
	});

	it('agrees on 30 generated networks with a relay or a diode isolator to a rear bank', () => {
		let compared = 0;
		let conducting = 0;
		for (let k = 1; k <= 30; k++) {
			const r = rng(5000 + k);
			const diode = k % 2 === 0;
			const doc = withIsolatedRear(
				randomNetwork(3000 + k * 41),
				{
					kind: diode ? 'diode' : 'relay',
					closes: r.pick(['engine_running', 'always', 'open'] as const),
					closedResistanceOhm: r.between(0.0002, 0.01),
					forwardDropV: diode ? r.between(0.3, 0.9) : 0,
				},
				r.between(0, 40),
			);
			doc.banks[doc.banks.length - 1]!.stateOfCharge = r.between(0.3, 1);
			const conditions = {
				engineRpm: k % 3 === 0 ? 0 : 1800,
				demand: k % 2 === 0 ? 1 : 1 / 8,
				conductorTempC: 25,
			};
			const s = solveNetwork(doc, conditions);
			if (s.status !== 'ok') continue;
			if (Math.abs(s.isolators[0]!.currentA) > 0.1) conducting++;
			compare(doc, `iso_${k}`, conditions);
			compared++;
		}
		expect(compared).toBeGreaterThanOrEqual(25);
		// The cases must exercise the isolator, not only leave it open.
		expect(conducting).toBeGreaterThanOrEqual(8);
	});

	it('agrees on 20 generated networks with a DC-DC charger to an auxiliary bank', () => {
		let compared = 0;
		let limited = 0;
		for (let k = 1; k <= 20; k++) {
			const r = rng(9000 + k);
			const doc = withCharger(
				randomNetwork(8000 + k * 23),
				{
					targetV: r.between(13.2, 14.6),
					maxOutputA: r.between(10, 60),
					efficiency: r.between(0.8, 0.95),
					runs: r.pick(['engine_running', 'always'] as const),
				},
				r.between(0.2, 1),
				r.between(0, 20),
			);
			const conditions = {
				engineRpm: k % 4 === 0 ? 0 : 2000,
				demand: k % 2 ? 1 : 1 / 8,
				conductorTempC: 25,
			};
			const s = solveNetwork(doc, conditions);
			if (s.status !== 'ok') continue;
			if (s.chargers[0]!.atLimit) limited++;
			compare(doc, `dcdc_${k}`, conditions);
			compared++;
		}
		expect(compared).toBeGreaterThanOrEqual(16);
		// Both of its modes are exercised: at its limit, and holding its target.
		expect(limited).toBeGreaterThanOrEqual(3);
		expect(limited).toBeLessThanOrEqual(compared - 3);
	});

	// The transient analysis (.tran) of the same netlist with each capacitor bank as a capacitor
	// behind its series resistance: the burp switches on just after an operating point at rest,
	// where the capacitors charge; node voltages through the burp within 1e-3 relative.
	it('agrees through a burp on 12 generated networks with a capacitor bank (transient)', () => {
		const durationS = 0.3;
		const stepS = 0.001;
		let compared = 0;
		for (let k = 1; k <= 12; k++) {
			const r = rng(7000 + k);
			const doc = withCapacitorBank(randomNetwork(6000 + k * 29), {
				moduleFarads: r.between(50, 600),
				moduleEsrOhm: r.between(0.0003, 0.003),
				moduleRatedV: 2.7,
				inSeries: 6,
				inParallel: r.int(1, 3),
			});
			const conditions = {
				engineRpm: k % 3 === 0 ? 0 : 1800,
				demand: 1,
				conductorTempC: 25,
			};
			const run = runBurp(doc, { ...conditions, durationS, stepS });
			if (run.collapsedAtS !== null) continue;
			const file = path.join(dir, `tran_${k}.dat`);
			const ex = toSpiceNetlist(doc, conditions, {
				title: `tran_${k}`,
				nodeset: 'unloaded',
				transient: { durationS, stepS, file },
			});
			runNgspice(ex.netlist, `tran_${k}`);
			const [header, ...rows] = readFileSync(file, 'utf8').trim().split('\n');
			const names = header!.trim().split(/\s+/);
			const table = rows.map((line) => line.trim().split(/\s+/).map(Number));
			const column = (node: string) => (node === '0' ? -1 : names.indexOf(`v(${node})`));
			/** ngspice's value of a column at time t, linear between its own time points. */
			const at = (col: number, t: number) => {
				if (col < 0) return 0;
				let i = table.findIndex((row) => row[0]! >= t);
				if (i <= 0) i = Math.max(1, i < 0 ? table.length - 1 : 1);
				const [a, b] = [table[i - 1]!, table[i]!];
				const w = b[0]! === a[0]! ? 1 : (t - a[0]!) / (b[0]! - a[0]!);
				return a[col]! + w * (b[col]! - a[col]!);
			};
			const mismatches: string[] = [];
			doc.banks.forEach((b) => {
				const p = column(ex.nodeNames[b.positive]!);
				const n = column(ex.nodeNames[b.negative]!);
				run.timeS.forEach((t, i) => {
					const engine = run.bankV[b.id]![i]!;
					const spice = at(p, t) - at(n, t);
					if (Math.abs(engine - spice) > 1e-3 * Math.abs(spice))
						mismatches.push(`bank ${b.id} at ${t}s: engine ${engine} vs ngspice ${spice}`);
				});
			});
			const a = doc.amplifiers[0]!;
			const ap = column(ex.nodeNames[a.positive]!);
			const an = column(ex.nodeNames[a.negative]!);
			const lowest = run.timeS.map((t) =>
				Math.min(
					...doc.amplifiers.map(
						(x) =>
							at(column(ex.nodeNames[x.positive]!), t) - at(column(ex.nodeNames[x.negative]!), t),
					),
				),
			);
			run.timeS.forEach((t, i) => {
				if (Math.abs(run.minAmplifierV[i]! - lowest[i]!) > 1e-3 * Math.abs(lowest[i]!))
					mismatches.push(
						`lowest amplifier at ${t}s: engine ${run.minAmplifierV[i]} vs ngspice ${lowest[i]}`,
					);
			});
			// The capacitor does carry the start of the burp: its terminal moves over the run.
			expect(
				Math.abs(at(ap, stepS) - at(an, stepS) - (at(ap, durationS) - at(an, durationS))),
			).toBeGreaterThan(1e-3);
			expect(mismatches.slice(0, 5), `tran_${k}`).toEqual([]);
			compared++;
		}
		expect(compared).toBeGreaterThanOrEqual(10);
	}, 120_000);

	it('reads the export of a 1,000-cable network whole, and agrees on every node and cable', () => {
		const doc = syntheticNetwork(1000);
		expect(doc.cables).toHaveLength(1000);
		const checked = compare(doc, 'synthetic_1000', {
			engineRpm: 1500,
			demand: 1,
			conductorTempC: 25,
		});
		expect(checked).toBe(doc.cables.length + doc.nodes.length - 1);
	}, 60_000);
});

describe.skipIf(available)('engine against ngspice (ngspice missing)', () => {
	it('needs ngspice: install it with `apt-get install ngspice`', () => {
		throw new Error('ngspice is not installed: `apt-get install ngspice` (CI installs it).');
	});
});
