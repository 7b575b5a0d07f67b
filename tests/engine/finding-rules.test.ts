import { describe, expect, it } from 'vitest';
import { DEMO_BUILDS } from '../../db/demo/builds';
import { FINDING_RULES } from '../../src/engine/finding-rules';
import { buildReport, type WarningCode } from '../../src/engine/report';
import { amp, bank, cable, doc, node } from '../helpers/networks';

/** Every finding the report can make: the compiler checks this list against WarningCode. */
const EVERY_CODE = {
	voltage_collapse: true,
	drop_over_target: true,
	cable_drop_over_target: true,
	cmil_below_rule: true,
	over_capacity: true,
	unfused_battery_cable: true,
	fuse_too_far: true,
	fuse_above_capacity: true,
	fuse_below_demand: true,
	cable_too_small: true,
	charge_voltage_high: true,
	charge_voltage_low: true,
	set_point_above_vehicle: true,
	sustained_deficit: true,
	bank_not_secured: true,
	flooded_unvented: true,
	bank_charge_limited: true,
	cable_hot_in_burp: true,
	capacitor_over_rating: true,
	capacitor_burp_share: true,
	charger_at_limit: true,
} satisfies Record<WarningCode, true>;

describe('the findings table', () => {
	it('has exactly one rule per finding, each naming what it reads', () => {
		const codes = FINDING_RULES.map((r) => r.code);
		expect(new Set(codes).size).toBe(codes.length);
		expect([...codes].sort()).toEqual(Object.keys(EVERY_CODE).sort());
		for (const r of FINDING_RULES) expect(r.reads.length).toBeGreaterThan(0);
	});

	it('files every finding under the kind of part its rule is about', () => {
		for (const d of Object.values(DEMO_BUILDS)) {
			const r = buildReport(d);
			if (!r.ok) throw new Error('demo build does not solve');
			for (const w of r.warnings) {
				const rule = FINDING_RULES.find((x) => x.code === w.code)!;
				expect(w.element.kind).toBe(rule.about);
				expect(w).toMatchObject({ severity: rule.severity, safety: rule.safety });
			}
		}
	});

	it('words a distance in the member’s units (a fuse 30 in from the bank)', () => {
		// 18 in (0.45 m) as the largest distance: common practice, no published source.
		const d = doc({
			nodes: [node('bat', 'battery'), node('amp', 'amplifier'), node('gnd', 'chassis')],
			banks: [bank('b', 'bat', 'gnd')],
			amplifiers: [amp('a', 'amp', 'gnd', 500)],
			cables: [
				cable('feed', 'bat', 'amp', { kind: 'awg', awg: '4' }, 3, {
					fuses: [{ ratingA: 100, end: 'from', distanceM: 30 * 0.0254 }],
				}),
			],
		});
		const message = (units: 'metric' | 'imperial') => {
			const r = buildReport(d, {}, { units, burpRun: false });
			if (!r.ok) throw new Error('does not solve');
			return r.warnings.find((w) => w.code === 'fuse_too_far')!.message;
		};
		expect(message('metric')).toMatch(/76 cm .*45 cm/);
		expect(message('imperial')).toMatch(/30 in .*18 in/);
	});
});
