import { describe, expect, it } from 'vitest';
import { analyseRun } from '../../src/engine/run-analysis';
import { parseLoggerCsv } from '../../src/lib/logger-csv';
import { HAND_CSV } from '../helpers/logger-fixtures';

describe('analyseRun', () => {
	it('matches the hand computation', () => {
		const parsed = parseLoggerCsv(HAND_CSV, {
			time: 'time',
			volts: 'volts',
			amps: 'amps',
			timeUnit: 's',
		});
		if (!parsed.ok) throw new Error(parsed.message);
		const a = analyseRun(parsed.samples);
		expect(a.samples).toBe(4);
		expect(a.durationS).toBe(3);
		expect(a.minVolts).toBe(12.2);
		expect(a.meanVolts).toBeCloseTo(12.4, 12);
		expect(a.peakAmps).toBe(200);
		expect(a.meanAmps).toBe(100);
		expect(a.energyWh).toBeCloseTo(4300 / 3600, 12);
		expect(a.effective!.resistanceOhm).toBeCloseTo(0.002, 12);
		expect(a.effective!.openCircuitV).toBeCloseTo(12.6, 12);
		expect(a.effective!.r2).toBeCloseTo(1, 12);
	});

	it('gives no effective resistance when the current does not move', () => {
		expect(
			analyseRun([
				{ tS: 0, volts: 12, amps: 50 },
				{ tS: 1, volts: 12.1, amps: 50 },
			]).effective,
		).toBeNull();
	});
});

describe('parseLoggerCsv', () => {
	const map = { time: 'time', volts: 'volts', amps: 'amps', timeUnit: 's' as const };
	it.each([
		['an empty file', '', null, /empty/],
		['a missing column', 'time,volts\n0,12\n1,12\n', 1, /current column "amps" is not in the file/],
		[
			'text in a number column',
			'time,volts,amps\n0,12.6,0\n1,twelve,100\n',
			3,
			/Row 3: column "volts" holds "twelve"/,
		],
		['time going backwards', 'time,volts,amps\n1,12.6,0\n0,12.4,100\n', 3, /backwards/],
		['a single sample', 'time,volts,amps\n0,12.6,0\n', null, /at least two samples/],
	])('refuses %s, naming the row', (_what, text, row, message) => {
		const r = parseLoggerCsv(text, map);
		expect(r.ok).toBe(false);
		if (!r.ok) {
			expect(r.row).toBe(row);
			expect(r.message).toMatch(message);
		}
	});

	it('converts milliseconds and trims header spaces', () => {
		const r = parseLoggerCsv(' t_ms , V , I \n0,12,1\n500,11.9,2\n', {
			time: 't_ms',
			volts: 'V',
			amps: 'I',
			timeUnit: 'ms',
		});
		expect(r.ok && r.samples[1]).toEqual({ tS: 0.5, volts: 11.9, amps: 2 });
	});
});
