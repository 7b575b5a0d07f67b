import { applyCalibration, loggedVoltageModel } from '../../src/engine/calibrate';
import { solveNetwork } from '../../src/engine/solve';
import type { BuildDocument } from '../../src/engine/types';
import { DEMO_HISTORIES } from './builds';

/**
 * The demo season: invented events and runs with invented numbers, and logger traces for some
 * runs, made by the engine from the revision in force that day at the run's recorded conditions
 * (so the calibration of a demo run closes on its own log).
 */
export interface DemoEvent {
	key: string;
	name: string;
	/** The day, fixed in the demo season (YYYY-MM-DD). */
	on: string;
	days: number;
	place: string;
	format: string;
}

export const DEMO_EVENTS: DemoEvent[] = [
	{
		key: 'thaw',
		name: 'Thaw Out Meet',
		on: '2026-03-21',
		days: 1,
		place: 'North lot, fairground',
		format: 'SPL, single burp',
	},
	{
		key: 'river',
		name: 'Riverside Bass Day',
		on: '2026-05-16',
		days: 2,
		place: 'River park',
		format: 'SPL and SQ',
	},
	{
		key: 'summer',
		name: 'Midsummer Airfield Meet',
		on: '2026-06-20',
		days: 1,
		place: 'Old airfield',
		format: 'SPL, three runs',
	},
	{
		key: 'finals',
		name: 'Season Finals',
		on: '2026-09-19',
		days: 2,
		place: 'Exhibition hall car park',
		format: 'SPL finals',
	},
	{
		key: 'winter',
		name: 'Winter Open',
		on: '2027-01-16',
		days: 1,
		place: 'Indoor arena',
		format: 'SPL',
	},
];

export interface DemoRun {
	vehicle: 'Pebble' | 'Marlin' | 'Old Oak';
	event: string | null;
	/** The day, fixed in the demo season (YYYY-MM-DD). */
	on: string;
	scoreDb: number;
	frequencyHz: number;
	restingV: number;
	minV: number;
	ambientC: number;
	notes: string;
	/**
	 * A logger trace, made by the engine from the revision in force that day: the engine speed of
	 * the run, the banks' state of charge and how far their resistance had drifted from the build's
	 * figure (what a calibration of the run should find), the burp's length, and the seconds the
	 * logger ran at the resting draw before it (loggers start early).
	 */
	logger?: {
		engineRpm: number;
		stateOfCharge: number;
		bankResistanceFactor: number;
		/** Peak current as a fraction of what the amplifiers draw at full demand. */
		peakShare: number;
		seconds: number;
		leadS: number;
	};
}

export const DEMO_RUNS: DemoRun[] = [
	{
		vehicle: 'Pebble',
		event: 'thaw',
		on: '2026-03-21',
		scoreDb: 138.4,
		frequencyHz: 42,
		restingV: 12.7,
		minV: 11.1,
		ambientC: 9,
		notes: 'Kit wiring, warm feed afterwards.',
	},
	{
		vehicle: 'Pebble',
		event: 'river',
		on: '2026-05-16',
		scoreDb: 139.6,
		frequencyHz: 42,
		restingV: 12.1,
		minV: 10.3,
		ambientC: 21,
		notes: 'After the 4 AWG run.',
		logger: {
			engineRpm: 0,
			stateOfCharge: 0.8,
			bankResistanceFactor: 1.25,
			peakShare: 0.35,
			seconds: 4,
			leadS: 0.8,
		},
	},
	{
		vehicle: 'Pebble',
		event: 'summer',
		on: '2026-06-20',
		scoreDb: 140.1,
		frequencyHz: 41,
		restingV: 13.9,
		minV: 11.8,
		ambientC: 27,
		notes: 'Engine running, big three done.',
	},
	{
		vehicle: 'Marlin',
		event: 'thaw',
		on: '2026-03-21',
		scoreDb: 146.2,
		frequencyHz: 38,
		restingV: 12.8,
		minV: 11.0,
		ambientC: 9,
		notes: 'Front AGM only.',
	},
	{
		vehicle: 'Marlin',
		event: 'river',
		on: '2026-05-16',
		scoreDb: 147.9,
		frequencyHz: 38,
		restingV: 12.6,
		minV: 11.9,
		ambientC: 22,
		notes: 'Rear bank in.',
		logger: {
			engineRpm: 0,
			stateOfCharge: 0.86,
			bankResistanceFactor: 1.1,
			peakShare: 0.75,
			seconds: 5,
			leadS: 1.35,
		},
	},
	{
		vehicle: 'Marlin',
		event: 'summer',
		on: '2026-06-20',
		scoreDb: 148.6,
		frequencyHz: 37,
		restingV: 14.1,
		minV: 11.9,
		ambientC: 29,
		notes: 'Engine at fast idle.',
	},
	{
		vehicle: 'Marlin',
		event: 'finals',
		on: '2026-09-19',
		scoreDb: 148.3,
		frequencyHz: 37,
		restingV: 12.8,
		minV: 11.7,
		ambientC: 14,
		notes: 'Cold day; four-channel on.',
		logger: {
			engineRpm: 0,
			stateOfCharge: 0.78,
			bankResistanceFactor: 1.35,
			peakShare: 0.8,
			seconds: 5,
			leadS: 0.45,
		},
	},
	{
		vehicle: 'Old Oak',
		event: 'river',
		on: '2026-05-16',
		scoreDb: 153.8,
		frequencyHz: 33,
		restingV: 16.4,
		minV: 14.9,
		ambientC: 22,
		notes: 'One alternator.',
	},
	{
		vehicle: 'Old Oak',
		event: 'summer',
		on: '2026-06-20',
		scoreDb: 155.2,
		frequencyHz: 33,
		restingV: 17.2,
		minV: 16.6,
		ambientC: 30,
		notes: 'Second alternator.',
		logger: {
			engineRpm: 1500,
			stateOfCharge: 0.98,
			bankResistanceFactor: 1.15,
			peakShare: 0.8,
			seconds: 6,
			leadS: 2.1,
		},
	},
	{
		vehicle: 'Old Oak',
		event: 'finals',
		on: '2026-09-19',
		scoreDb: 155.9,
		frequencyHz: 32,
		restingV: 16.7,
		minV: 15.6,
		ambientC: 15,
		notes: 'Regulators at 17.8 V.',
	},
];

/** The revision of a demo vehicle in force on a day: the newest of its history saved by then. */
export function demoDocumentOn(vehicle: DemoRun['vehicle'], on: string): BuildDocument {
	const history = DEMO_HISTORIES[vehicle as keyof typeof DEMO_HISTORIES];
	const inForce = history.filter((h) => h.on <= on).at(-1) ?? history[0]!;
	return inForce.document;
}

/**
 * A burp trace at 20 samples per second, as a logger on the lowest amplifier would record it: the
 * resting draw for the lead, then the current ramps up, holds and ramps down, and each sample's
 * voltage is the engine's for that current on the revision in force, with the banks at the run's
 * state of charge and drifted resistance, read to the millivolt with a few millivolts of scatter.
 */
export function demoTrace(run: DemoRun): Array<{ tS: number; volts: number; amps: number }> {
	const l = run.logger!;
	const doc = applyCalibration(
		demoDocumentOn(run.vehicle, run.on),
		{
			bankResistance: l.bankResistanceFactor,
			alternatorOutput: 1,
			connectionMilliohm: 0,
			stateOfCharge: l.stateOfCharge,
		},
		undefined,
	);
	const conditions = { engineRpm: l.engineRpm, conductorTempC: 25 };
	const volts = loggedVoltageModel(doc, conditions);
	const fullA = solveNetwork(doc, { ...conditions, demand: 1 }).amplifiers.reduce(
		(t, a) => t + a.currentA,
		0,
	);
	const peakA = fullA * l.peakShare;
	const out: Array<{ tS: number; volts: number; amps: number }> = [];
	const restA = 14;
	const n = Math.round((l.leadS + l.seconds) * 20);
	for (let i = 0; i <= n; i++) {
		const tAll = i / 20;
		const t = tAll - l.leadS;
		const envelope =
			t < 0 ? 0 : t < 0.5 ? t / 0.5 : t > l.seconds - 0.5 ? Math.max(0, (l.seconds - t) / 0.5) : 1;
		const ripple = 1 + 0.03 * Math.sin(i * 1.7);
		const amps = Math.round(Math.max(restA, peakA * envelope * ripple) * 10) / 10;
		// A logger's scatter: a few millivolts, deterministic so the demo is the same every time.
		const scatter = 0.003 * Math.sin(i * 12.9898 + 78.233);
		out.push({
			tS: Math.round(tAll * 1000) / 1000,
			volts: Math.round((volts(amps) + scatter) * 1000) / 1000,
			amps,
		});
	}
	return out;
}
