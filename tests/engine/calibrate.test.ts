import { describe, expect, it } from 'vitest';
import { marlinBuild } from '../../db/demo/builds';
import { applyCalibration, calibrateFromRun } from '../../src/engine/calibrate';
import type { Sample } from '../../src/engine/run-analysis';
import { solveNetwork } from '../../src/engine/solve';
import type { BuildDocument } from '../../src/engine/types';
import { rng } from '../helpers/networks';

const AT = { engineRpm: 1500, conductorTempC: 25 };

/**
 * A logged run made by the engine itself from a build whose parameters were changed: the full
 * model (constant-power amplifiers, not the fit's current sinks) at demands swept up and down,
 * read as the lowest amplifier's terminal voltage and the current into the amplifiers. Optional
 * Gaussian noise on the voltage (Box–Muller from a seeded generator).
 */
function loggedRun(doc: BuildDocument, noiseV = 0, seed = 7): Sample[] {
	const random = rng(seed).next;
	const gauss = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
	const out: Sample[] = [];
	for (let i = 0; i <= 80; i++) {
		const demand = 0.05 + 0.95 * Math.abs(Math.sin((i / 80) * Math.PI));
		const s = solveNetwork(doc, { ...AT, demand });
		out.push({
			tS: i * 0.1,
			volts: Math.min(...s.amplifiers.map((a) => a.terminalV)) + noiseV * gauss(),
			amps: s.amplifiers.reduce((t, a) => t + a.currentA, 0),
		});
	}
	return out;
}

const ratio = (p: { before: number; fitted: number }) => p.fitted / p.before;

describe('calibration from a logged run', () => {
	it('recovers a tired bank and a weak alternator within 5 %', () => {
		// Truth: banks 40 % above their stated resistance, the alternator giving 85 % of its curve.
		const truth = applyCalibration(
			marlinBuild,
			{ bankResistance: 1.4, alternatorOutput: 0.85, connectionMilliohm: 0 },
			undefined,
		);
		const r = calibrateFromRun(marlinBuild, loggedRun(truth), {
			...AT,
			fit: ['bankResistance', 'alternatorOutput'],
		});
		if (!r.ok) throw new Error(r.reason);
		const [bank, alt] = r.parameters;
		expect(ratio(bank!)).toBeGreaterThan(1.4 * 0.95);
		expect(ratio(bank!)).toBeLessThan(1.4 * 1.05);
		expect(ratio(alt!)).toBeGreaterThan(0.85 * 0.95);
		expect(ratio(alt!)).toBeLessThan(0.85 * 1.05);
		expect(bank!.determined && alt!.determined).toBe(true);
		expect(r.rmsAfterV).toBeLessThan(r.rmsBeforeV / 5);
	});

	it('recovers a crimp’s extra resistance in one cable within 5 %', () => {
		const truth = applyCalibration(
			marlinBuild,
			{ bankResistance: 1, alternatorOutput: 1, connectionMilliohm: 1.5 },
			'block_feed',
		);
		const r = calibrateFromRun(marlinBuild, loggedRun(truth), {
			...AT,
			fit: ['connection'],
			cableId: 'block_feed',
		});
		if (!r.ok) throw new Error(r.reason);
		const crimp = r.parameters[0]!;
		expect(crimp.unit).toBe('mΩ');
		expect(crimp.fitted - crimp.before).toBeGreaterThan(1.5 * 0.95);
		expect(crimp.fitted - crimp.before).toBeLessThan(1.5 * 1.05);
		// The plan it offers holds the fitted value; the revision is left as it was.
		expect(
			r.document.cables.find((c) => c.id === 'block_feed')!.connectionResistanceOhm,
		).toBeCloseTo(crimp.fitted / 1000, 12);
		expect(
			marlinBuild.cables.find((c) => c.id === 'block_feed')!.connectionResistanceOhm,
		).toBeUndefined();
	});

	it('widens the stated uncertainty with noisy samples instead of moving the answer far', () => {
		const truth = applyCalibration(
			marlinBuild,
			{ bankResistance: 1.4, alternatorOutput: 0.85, connectionMilliohm: 0 },
			undefined,
		);
		const opts = { ...AT, fit: ['bankResistance', 'alternatorOutput'] as const };
		const clean = calibrateFromRun(marlinBuild, loggedRun(truth), { ...opts, fit: [...opts.fit] });
		// 50 mV of noise: a cheap logger's scatter.
		const noisy = calibrateFromRun(marlinBuild, loggedRun(truth, 0.05), {
			...opts,
			fit: [...opts.fit],
		});
		if (!clean.ok || !noisy.ok) throw new Error('did not fit');
		for (const j of [0, 1]) {
			const c = clean.parameters[j]!;
			const n = noisy.parameters[j]!;
			expect(n.uncertainty!).toBeGreaterThan(c.uncertainty!);
			// The true value lies inside the noisy fit's stated interval, and not far from it.
			const trueValue = c.before * (j === 0 ? 1.4 : 0.85);
			expect(Math.abs(n.fitted - trueValue)).toBeLessThan(n.uncertainty! * 1.5);
			expect(Math.abs(n.fitted / trueValue - 1)).toBeLessThan(0.1);
		}
	});

	it('says a value is not determined when the samples cannot move it', () => {
		// Engine off: the alternator gives nothing at any output, so the log says nothing about it.
		const r = calibrateFromRun(marlinBuild, loggedRun(marlinBuild), {
			engineRpm: 0,
			conductorTempC: 25,
			fit: ['bankResistance', 'alternatorOutput'],
		});
		if (!r.ok) throw new Error(r.reason);
		expect(r.parameters[1]!.determined).toBe(false);
		expect(r.parameters[1]!.uncertainty).toBeNull();
	});

	it('refuses a log too short for the values asked', () => {
		const r = calibrateFromRun(marlinBuild, loggedRun(marlinBuild).slice(0, 3), {
			...AT,
			fit: ['bankResistance', 'alternatorOutput'],
		});
		expect(r.ok).toBe(false);
	});
});
