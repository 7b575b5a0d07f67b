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
import { randomNetwork, rng, withIsolatedRear } from '../helpers/networks';

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
