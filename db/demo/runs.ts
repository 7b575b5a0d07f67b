/**
 * The demo season: invented events and runs with invented numbers, and synthetic logger traces
 * (a burp drawn against a sagging supply) for some runs.
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
	/** Synthetic logger trace: open-circuit voltage, source resistance and peak current. */
	logger?: {
		ocvV: number;
		resistanceOhm: number;
		peakA: number;
		seconds: number;
		/** Seconds the logger ran at the resting draw before the burp (loggers start early). */
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
		restingV: 12.8,
		minV: 11.5,
		ambientC: 21,
		notes: 'After the 4 AWG run.',
		logger: { ocvV: 12.8, resistanceOhm: 0.0105, peakA: 125, seconds: 4, leadS: 0.8 },
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
		restingV: 12.9,
		minV: 11.6,
		ambientC: 22,
		notes: 'Rear bank in.',
		logger: { ocvV: 12.9, resistanceOhm: 0.0024, peakA: 560, seconds: 5, leadS: 1.35 },
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
		logger: { ocvV: 12.8, resistanceOhm: 0.0022, peakA: 600, seconds: 5, leadS: 0.45 },
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
		restingV: 16.6,
		minV: 15.4,
		ambientC: 30,
		notes: 'Second alternator.',
		logger: { ocvV: 16.6, resistanceOhm: 0.0011, peakA: 980, seconds: 6, leadS: 2.1 },
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

/**
 * A synthetic burp trace at 20 samples per second: the resting draw for the lead, then the current
 * ramps up, holds and ramps down while the voltage sags through R.
 */
export function demoTrace(
	l: NonNullable<DemoRun['logger']>,
): Array<{ tS: number; volts: number; amps: number }> {
	const out: Array<{ tS: number; volts: number; amps: number }> = [];
	const restA = 14;
	const n = Math.round((l.leadS + l.seconds) * 20);
	for (let i = 0; i <= n; i++) {
		const tAll = i / 20;
		const t = tAll - l.leadS;
		const envelope =
			t < 0 ? 0 : t < 0.5 ? t / 0.5 : t > l.seconds - 0.5 ? Math.max(0, (l.seconds - t) / 0.5) : 1;
		const ripple = 1 + 0.03 * Math.sin(i * 1.7);
		const amps = Math.max(restA, l.peakA * envelope * ripple);
		const sag = envelope > 0.9 ? 0.0004 * Math.max(0, t * 20) : 0;
		const volts = l.ocvV - l.resistanceOhm * amps - sag;
		out.push({
			tS: Math.round(tAll * 1000) / 1000,
			volts: Math.round(volts * 1000) / 1000,
			amps: Math.round(amps * 10) / 10,
		});
	}
	return out;
}
