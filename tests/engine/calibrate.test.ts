import { describe, expect, it } from 'vitest';
import { marlinBuild } from '../../db/demo/builds';
import { DEMO_RUNS, demoDocumentOn, demoTrace } from '../../db/demo/runs';
import { defaultCalibrationFit, engineSpeedGuess } from '../../src/lib/engine-speed-guess';
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

/** As `loggedRun`, at other conditions (engine speed), demand swept the same way. */
function loggedRunAt(
	doc: BuildDocument,
	at: { engineRpm: number; conductorTempC: number },
	noiseV = 0,
	seed = 11,
	peakDemand = 0.65,
): Sample[] {
	const random = rng(seed).next;
	const gauss = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
	return Array.from({ length: 81 }, (_, i) => {
		const demand = 0.05 + (peakDemand - 0.05) * Math.abs(Math.sin((i / 80) * Math.PI));
		const s = solveNetwork(doc, { ...at, demand });
		return {
			tS: i * 0.1,
			volts: Math.min(...s.amplifiers.map((a) => a.terminalV)) + noiseV * gauss(),
			amps: s.amplifiers.reduce((t, a) => t + a.currentA, 0),
		};
	});
}

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
		expect(r.parameters[1]!.reason).toMatch(/engine was off/);
		// The bank's resistance is still fitted, with its bounds.
		expect(r.parameters[0]).toMatchObject({ determined: true, reason: null });
		expect(r.parameters[0]!.uncertainty).toBeGreaterThan(0);
	});

	it('fits a log that rests below the model (banks not full) once the charge is a value to fit', () => {
		// Truth: banks at 70 % charge and 30 % over their resistance, engine off. Hand reasoning: at
		// rest the log reads the banks' open-circuit voltage at 70 %, below the build's stated charge,
		// which no resistance can explain; the charge accounts for the offset and the resistance for
		// the slope.
		const truth = applyCalibration(
			marlinBuild,
			{ bankResistance: 1.3, alternatorOutput: 1, connectionMilliohm: 0, stateOfCharge: 0.7 },
			undefined,
		);
		const off = { engineRpm: 0, conductorTempC: 25 };
		const log = loggedRunAt(truth, off, 0.003);
		const r = calibrateFromRun(marlinBuild, log, { ...off, fit: ['bankResistance', 'bankCharge'] });
		if (!r.ok) throw new Error(r.reason);
		const [bankR, charge] = r.parameters;
		expect(bankR!.determined && charge!.determined).toBe(true);
		expect(Math.abs(ratio(bankR!) - 1.3)).toBeLessThan(bankR!.uncertainty! / bankR!.before + 0.03);
		expect(Math.abs(charge!.fitted - 70)).toBeLessThan(charge!.uncertainty! + 1);
		expect(r.rmsAfterV).toBeLessThan(0.01);
	});

	it('fits a tired bank and a weak alternator from a noisy log with the engine running, each with bounds', () => {
		// Truth: banks 30 % over their resistance, the alternator at 90 % of its curve, a full burp,
		// 5 mV of logger noise.
		const truth = applyCalibration(
			marlinBuild,
			{ bankResistance: 1.3, alternatorOutput: 0.9, connectionMilliohm: 0 },
			undefined,
		);
		const log = loggedRunAt(truth, AT, 0.005, 11, 1);
		const r = calibrateFromRun(marlinBuild, log, {
			...AT,
			fit: ['bankResistance', 'alternatorOutput'],
		});
		if (!r.ok) throw new Error(r.reason);
		for (const p of r.parameters) {
			expect(p.determined, `${p.key}: ${p.reason}`).toBe(true);
			expect(p.uncertainty).toBeGreaterThan(0);
		}
		const [bankR, alt] = r.parameters;
		expect(ratio(bankR!)).toBeGreaterThan(1.3 * 0.95);
		expect(ratio(bankR!)).toBeLessThan(1.3 * 1.05);
		expect(ratio(alt!)).toBeGreaterThan(0.9 * 0.95);
		expect(ratio(alt!)).toBeLessThan(0.9 * 1.05);

		// The default choice with the engine running adds the banks' charge: the burp's limited part
		// gives V_oc + R·I_alt and its slope R, the knee where the alternators reach their limit
		// separates the two, so all three come with bounds (truth: the build's 89 %).
		const three = calibrateFromRun(marlinBuild, log, {
			...AT,
			fit: ['bankResistance', 'bankCharge', 'alternatorOutput'],
		});
		if (!three.ok) throw new Error(three.reason);
		for (const p of three.parameters) expect(p.determined, `${p.key}: ${p.reason}`).toBe(true);
		expect(ratio(three.parameters[0]!)).toBeGreaterThan(1.3 * 0.95);
		expect(ratio(three.parameters[0]!)).toBeLessThan(1.3 * 1.05);
		expect(Math.abs(three.parameters[1]!.fitted - 89)).toBeLessThan(3);
		expect(ratio(three.parameters[2]!)).toBeGreaterThan(0.9 * 0.95);
		expect(ratio(three.parameters[2]!)).toBeLessThan(0.9 * 1.05);
		expect(three.rmsAfterV).toBeLessThan(0.01);
	});

	it('names the value a log cannot tell apart from another instead of giving neither', () => {
		// Engine off, one path from the banks: a joint in the block feed and the banks' resistance
		// both add series resistance on it, so the log cannot split the two (Ohm's law: only their
		// sum sets the slope). The bank's is fitted; the joint is named as the one not told apart.
		const truth = applyCalibration(
			marlinBuild,
			{ bankResistance: 1.2, alternatorOutput: 1, connectionMilliohm: 0 },
			undefined,
		);
		const off = { engineRpm: 0, conductorTempC: 25 };
		const r = calibrateFromRun(marlinBuild, loggedRunAt(truth, off), {
			...off,
			fit: ['bankResistance', 'connection'],
			cableId: 'block_feed',
		});
		if (!r.ok) throw new Error(r.reason);
		expect(r.parameters[0]!.determined).toBe(true);
		expect(r.parameters[1]).toMatchObject({ determined: false });
		expect(r.parameters[1]!.reason).toMatch(
			/cannot tell it apart from the bank internal resistance/,
		);
	});

	it('closes every demo log under 0.05 V rms with the default choice, each value with bounds', () => {
		for (const run of DEMO_RUNS.filter((x) => x.logger)) {
			const doc = demoDocumentOn(run.vehicle, run.on);
			const log = demoTrace(run);
			const engine = engineSpeedGuess(doc, log);
			expect(engine.rpm).toBe(run.logger!.engineRpm);
			const r = calibrateFromRun(doc, log, {
				engineRpm: engine.rpm,
				conductorTempC: 25,
				fit: defaultCalibrationFit(engine.rpm),
			});
			if (!r.ok) throw new Error(r.reason);
			expect(r.rmsAfterV, `${run.vehicle} ${run.on}`).toBeLessThan(0.05);
			for (const p of r.parameters) expect(p.determined, `${run.vehicle}: ${p.reason}`).toBe(true);
			// The banks' drift the demo log was made with is what the fit finds (to its bounds + 2 %).
			const bankR = r.parameters.find((p) => p.key === 'bankResistance')!;
			expect(Math.abs(ratio(bankR) - run.logger!.bankResistanceFactor)).toBeLessThan(
				bankR.uncertainty! / bankR.before + 0.02,
			);
		}
	});

	it('refuses a log too short for the values asked', () => {
		const r = calibrateFromRun(marlinBuild, loggedRun(marlinBuild).slice(0, 3), {
			...AT,
			fit: ['bankResistance', 'alternatorOutput'],
		});
		expect(r.ok).toBe(false);
	});
});
