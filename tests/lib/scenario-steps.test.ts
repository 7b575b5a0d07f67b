import { describe, expect, it } from 'vitest';
import { DEFAULT_SCENARIO } from '../../src/engine/report';
import { keyPart } from '../../src/lib/server/engine/cache';
import { canonicalScenario } from '../../src/lib/scenario-steps';

/** Server answers are cached by the conditions on the steps the form offers. */
describe('the canonical scenario', () => {
	const key = (s: Parameters<typeof canonicalScenario>[0]) => keyPart(canonicalScenario(s));

	it('makes one key of values that round to the same step', () => {
		expect(key({ engineRpm: 2000 })).toBe(key({ engineRpm: 2000.4 }));
		expect(key({ engineRpm: 2000 })).toBe(key({ engineRpm: 1951 }));
		expect(key({ engineRpm: 2000 })).not.toBe(key({ engineRpm: 2100 }));
		expect(key({ conductorTempC: 41 })).toBe(key({ conductorTempC: 40 }));
	});

	it('leaves out what equals the default, so a default spelled out is the plain answer', () => {
		expect(canonicalScenario({ engineRpm: DEFAULT_SCENARIO.engineRpm })).toEqual({});
		expect(canonicalScenario({ engineRpm: DEFAULT_SCENARIO.engineRpm + 20 })).toEqual({});
		expect(key({})).toBe(key({ conductorTempC: 25, burpDemand: 1 }));
	});

	it('prints each value as its step is written and sorts the voltages', () => {
		expect(canonicalScenario({ sustainedDemand: 0.30000000004 })).toEqual({
			sustainedDemand: 0.3,
		});
		expect(canonicalScenario({ voltagesV: [14.04, 12, 12.01, 13.8] })).toEqual({
			voltagesV: [12, 13.8, 14],
		});
	});

	it('keeps a small positive level at its least step rather than zero', () => {
		expect(canonicalScenario({ burpDemand: 0.01 })).toEqual({ burpDemand: 0.05 });
		expect(canonicalScenario({ engineRpm: 20 })).toEqual({ engineRpm: 0 });
	});
});
