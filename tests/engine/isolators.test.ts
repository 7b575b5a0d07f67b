import { describe, expect, it } from 'vitest';
import { bankThevenin } from '../../src/engine/battery';
import { parseBuildDocument } from '../../src/engine/document-schema';
import { runSession, engineOffPlayTime } from '../../src/engine/session';
import { solveNetwork } from '../../src/engine/solve';
import { toSpiceNetlist } from '../../src/engine/spice';
import type { BuildDocument, Isolator } from '../../src/engine/types';
import {
	alternator,
	amp,
	bank,
	cable,
	doc,
	node,
	steady,
	withIsolatedRear,
} from '../helpers/networks';

/** One bank, a relay or isolator from its positive to a node carrying a steady load. */
function oneLink(
	iso: Omit<Isolator, 'id' | 'label' | 'from' | 'to'>,
	loadA: number,
): BuildDocument {
	return doc({
		nodes: [node('chassis', 'chassis'), node('front', 'battery'), node('rear', 'block')],
		banks: [bank('b', 'front', 'chassis')],
		loads: [steady('l', 'rear', 'chassis', loadA)],
		isolators: [{ id: 'iso', label: 'Isolator', from: 'front', to: 'rear', ...iso }],
	});
}

const running = { engineRpm: 1500, demand: 1, conductorTempC: 25 };
const off = { ...running, engineRpm: 0 };

describe('relays and isolators', () => {
	// Ohm's law and Kirchhoff's current law (any circuits text, e.g. Hayt & Kemmerly, Engineering
	// Circuit Analysis, ch. 2–3): the load's node sits below the bank's open-circuit voltage by the
	// load current times the bank's resistance plus the relay's.
	it('a closed relay drops its current times its resistance', () => {
		const d = oneLink(
			{ kind: 'relay', closes: 'always', closedResistanceOhm: 0.002, forwardDropV: 0 },
			50,
		);
		const th = bankThevenin(d.banks[0]!, d.banks[0]!.stateOfCharge);
		const s = solveNetwork(d, running);
		const expected = th.ocvV - 50 * (th.resistanceOhm + 0.002);
		expect(s.nodeVoltages.rear).toBeCloseTo(expected, 6);
		expect(s.isolators[0]).toMatchObject({ id: 'iso', closed: true });
		expect(s.isolators[0]!.currentA).toBeCloseTo(50, 6);
		expect(s.isolators[0]!.dropV).toBeCloseTo(0.1, 6);
		expect(s.isolators[0]!.lossW).toBeCloseTo(5, 6);
	});

	// The constant-voltage-drop diode with a series resistance (the piecewise-linear model of
	// Sedra & Smith, Microelectronic Circuits, ch. 4): forward it drops Vf + I·Rd.
	it('a diode isolator drops its forward voltage plus its current times its slope resistance', () => {
		const d = oneLink(
			{ kind: 'diode', closes: 'always', closedResistanceOhm: 0.004, forwardDropV: 0.7 },
			40,
		);
		const th = bankThevenin(d.banks[0]!, d.banks[0]!.stateOfCharge);
		const s = solveNetwork(d, running);
		expect(s.nodeVoltages.rear).toBeCloseTo(th.ocvV - 40 * th.resistanceOhm - 0.7 - 40 * 0.004, 6);
		expect(s.isolators[0]!.dropV).toBeCloseTo(0.7 + 40 * 0.004, 6);
	});

	// Same model, reverse side: below its forward drop a diode carries nothing, so a fuller rear
	// bank never pushes current back into the front.
	it('a diode isolator never carries current backwards', () => {
		const d = withIsolatedRear(
			doc({
				nodes: [node('chassis', 'chassis'), node('front', 'battery')],
				banks: [bank('front', 'front', 'chassis', { stateOfCharge: 0.3 })],
				loads: [steady('front_load', 'front', 'chassis', 30)],
			}),
			{ kind: 'diode', closes: 'always', closedResistanceOhm: 0.004, forwardDropV: 0.6 },
			0,
		);
		d.banks[1]!.stateOfCharge = 1;
		const s = solveNetwork(d, off);
		expect(s.isolators[0]!.currentA).toBe(0);
		// With a relay instead the fuller rear bank does feed the front.
		const relay = {
			...d,
			isolators: [{ ...d.isolators![0]!, kind: 'relay' as const, forwardDropV: 0 }],
		};
		expect(solveNetwork(relay, off).isolators[0]!.currentA).toBeLessThan(-1);
	});

	it('a relay on the ignition is open with the engine off and closed with it running', () => {
		const d = oneLink(
			{ kind: 'relay', closes: 'engine_running', closedResistanceOhm: 0.001, forwardDropV: 0 },
			0,
		);
		d.loads = [];
		d.banks.push(bank('rear', 'rear', 'chassis', { stateOfCharge: 0.5 }));
		const atRest = solveNetwork(d, off);
		expect(atRest.isolators[0]).toMatchObject({ closed: false, currentA: 0 });
		// Open, it holds the two banks' rest voltages apart.
		expect(atRest.isolators[0]!.dropV).toBeGreaterThan(0.1);
		const driving = solveNetwork(d, running);
		expect(driving.isolators[0]!.closed).toBe(true);
		expect(driving.isolators[0]!.currentA).toBeGreaterThan(1);
		const never = { ...d, isolators: [{ ...d.isolators![0]!, closes: 'open' as const }] };
		expect(solveNetwork(never, running).isolators[0]!.closed).toBe(false);
	});

	it('counts its loss with the wiring: power in equals power out plus the loss', () => {
		const d = oneLink(
			{ kind: 'diode', closes: 'always', closedResistanceOhm: 0.003, forwardDropV: 0.5 },
			60,
		);
		const { sourcesW, loadsW, cableLossW } = solveNetwork(d, running).power;
		expect(Math.abs(sourcesW - loadsW - cableLossW) / sourcesW).toBeLessThan(1e-6);
		expect(cableLossW).toBeCloseTo(60 * (0.5 + 60 * 0.003), 6);
	});

	it('engine-off play time leaves the starting bank apart behind a relay on the ignition', () => {
		const base = doc({
			nodes: [node('chassis', 'chassis'), node('front', 'battery'), node('amp_pos', 'amplifier')],
			banks: [bank('front', 'front', 'chassis')],
			amplifiers: [amp('a', 'amp_pos', 'chassis', 4000)],
			cables: [cable('feed', 'rear_pos', 'amp_pos', { kind: 'awg', awg: '4' }, 1)],
		});
		const play = (closes: Isolator['closes']) =>
			engineOffPlayTime(
				withIsolatedRear(
					base,
					{ kind: 'relay', closes, closedResistanceOhm: 0.001, forwardDropV: 0 },
					0,
				),
				{ demand: 1 / 8, conductorTempC: 25, cutoffV: null },
			);
		const apart = play('engine_running');
		const joined = play('always');
		expect(apart.seconds).not.toBeNull();
		expect(joined.seconds).not.toBeNull();
		// Joined, both banks carry the music; apart, the rear bank alone does.
		expect(joined.seconds!).toBeGreaterThan(1.5 * apart.seconds!);
		expect(play('open').seconds).toBeCloseTo(apart.seconds!, 6);
	});

	it('the session charges the rear bank through a relay on the ignition only while it is closed', () => {
		const base = doc({
			nodes: [node('chassis', 'chassis'), node('front', 'battery'), node('alt', 'alternator')],
			banks: [bank('front', 'front', 'chassis')],
			alternators: [alternator('alt', 'alt', 'chassis', 150)],
			cables: [cable('charge', 'alt', 'front', { kind: 'awg', awg: '1/0' }, 1)],
		});
		const rearSoc = (closes: Isolator['closes']) => {
			const d = withIsolatedRear(
				base,
				{ kind: 'relay', closes, closedResistanceOhm: 0.001, forwardDropV: 0 },
				5,
			);
			d.banks[1]!.stateOfCharge = 0.5;
			const run = runSession(d, { engineRpm: 1500, burps: 2 });
			return run.trace.soc.rear!.at(-1)!;
		};
		expect(rearSoc('engine_running')).toBeGreaterThan(0.5);
		expect(rearSoc('open')).toBeLessThan(0.5);
	});

	it('goes to SPICE as a resistor or a one-way behavioural source, and an open one not at all', () => {
		const d = oneLink(
			{ kind: 'diode', closes: 'engine_running', closedResistanceOhm: 0.004, forwardDropV: 0.7 },
			10,
		);
		expect(toSpiceNetlist(d, running).netlist).toMatch(/^biso1 n\d+ n\d+ I=max\(/m);
		expect(toSpiceNetlist(d, off).netlist).not.toMatch(/^biso1/m);
		const relay = { ...d, isolators: [{ ...d.isolators![0]!, kind: 'relay' as const }] };
		expect(toSpiceNetlist(relay, running).netlist).toMatch(/^riso1 n\d+ n\d+ 0\.004/m);
	});
});

describe('the document schema for relays and isolators', () => {
	const valid = oneLink(
		{ kind: 'relay', closes: 'always', closedResistanceOhm: 0.001, forwardDropV: 0 },
		5,
	);

	it('reads a document saved before isolators existed as having none', () => {
		const older: BuildDocument = doc({
			nodes: [node('chassis', 'chassis'), node('front', 'battery')],
			banks: [bank('b', 'front', 'chassis')],
			loads: [steady('l', 'front', 'chassis', 5)],
		});
		expect('isolators' in older).toBe(false);
		const parsed = parseBuildDocument(older);
		expect(parsed.ok).toBe(true);
		if (parsed.ok) expect(solveNetwork(parsed.doc, running).isolators).toEqual([]);
	});

	it.each([
		['kind', 'fuse', 'isolators.0.kind'],
		['closes', 'sometimes', 'isolators.0.closes'],
		['closedResistanceOhm', 0, 'isolators.0.closedResistanceOhm'],
		['closedResistanceOhm', 5, 'isolators.0.closedResistanceOhm'],
		['forwardDropV', -0.1, 'isolators.0.forwardDropV'],
		['forwardDropV', 3, 'isolators.0.forwardDropV'],
		['to', 'nowhere', 'isolators.0.to'],
		['to', 'front', 'isolators.0.to'],
	])('refuses %s = %s by its path', (field, value, path) => {
		const bad = { ...valid, isolators: [{ ...valid.isolators![0]!, [field]: value }] };
		const parsed = parseBuildDocument(bad);
		expect(parsed.ok).toBe(false);
		if (!parsed.ok) expect(parsed.problems.map((p) => p.path)).toContain(path);
	});

	it('counts an isolator as wiring: the node behind it is connected, and fed', () => {
		const parsed = parseBuildDocument(valid);
		expect(parsed).toMatchObject({ ok: true });
	});

	it('refuses an isolator whose id another part has', () => {
		const bad = { ...valid, isolators: [{ ...valid.isolators![0]!, id: 'b' }] };
		const parsed = parseBuildDocument(bad);
		expect(parsed.ok).toBe(false);
	});
});
