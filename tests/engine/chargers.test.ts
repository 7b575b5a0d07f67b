import { describe, expect, it } from 'vitest';
import { parseBuildDocument } from '../../src/engine/document-schema';
import { CHARGER_SOURCE_OHM } from '../../src/engine/network';
import { buildReport } from '../../src/engine/report';
import { solveNetwork } from '../../src/engine/solve';
import { toSpiceNetlist } from '../../src/engine/spice';
import { alternator, bank, cable, doc, node, withCharger } from '../helpers/networks';

const base = doc({
	nodes: [node('chassis', 'chassis'), node('front', 'battery'), node('alt', 'alternator')],
	banks: [bank('front', 'front', 'chassis')],
	alternators: [alternator('alt', 'alt', 'chassis', 150)],
	cables: [cable('charge', 'alt', 'front', { kind: 'awg', awg: '1/0' }, 1)],
});
const running = { engineRpm: 1500, demand: 1, conductorTempC: 25 };

describe('DC-DC chargers', () => {
	// The power balance of a DC-DC converter: P_in = P_out / η (Erickson & Maksimović,
	// Fundamentals of Power Electronics, ch. 1). An empty auxiliary bank takes all it can give, so it
	// runs at its output limit.
	it('draws its output power over its efficiency, at its limit for an empty bank', () => {
		const d = withCharger(base, { maxOutputA: 25, efficiency: 0.85 }, 0.2, 0);
		expect(parseBuildDocument(d)).toMatchObject({ ok: true });
		const s = solveNetwork(d, running);
		const c = s.chargers[0]!;
		expect(c.running).toBe(true);
		expect(c.outputA).toBeCloseTo(25, 9);
		expect(c.atLimit).toBe(true);
		expect(c.inputA * c.inputV * 0.85).toBeCloseTo(c.outputA * c.outputV, 6);
		const { sourcesW, loadsW, cableLossW } = s.power;
		expect(Math.abs(sourcesW - loadsW - cableLossW) / sourcesW).toBeLessThan(1e-6);
		const report = buildReport(d, { engineRpm: 1500 }, { burpRun: false });
		if (!report.ok) throw new Error('no report');
		expect(report.warnings.map((w) => w.code)).toContain('charger_at_limit');
	});

	// Below its limit it regulates its output to the target, less its (small) stiffness drop.
	it('holds its target voltage when the bank behind it takes less than its limit', () => {
		const d = withCharger(base, { maxOutputA: 60, targetV: 13.2 }, 0.95, 2);
		const c = solveNetwork(d, running).chargers[0]!;
		expect(c.atLimit).toBe(false);
		expect(c.outputA).toBeGreaterThan(0);
		expect(c.outputA).toBeLessThan(60);
		expect(c.outputV).toBeCloseTo(13.2 - c.outputA * CHARGER_SOURCE_OHM, 9);
	});

	it('runs with the engine only when it is told to', () => {
		const d = withCharger(base, { runs: 'engine_running' }, 0.3, 0);
		const off = solveNetwork(d, { ...running, engineRpm: 0 }).chargers[0]!;
		expect(off).toMatchObject({ running: false, outputA: 0, inputA: 0 });
		expect(solveNetwork(d, running).chargers[0]!.running).toBe(true);
		expect(toSpiceNetlist(d, { ...running, engineRpm: 0 }).netlist).not.toMatch(/^bdcin/m);
	});

	it('refuses an efficiency above one and an unknown way of running, by path', () => {
		const d = withCharger(base);
		for (const [field, value] of [
			['efficiency', 1.2],
			['runs', 'sometimes'],
			['maxOutputA', 0],
		] as const) {
			const bad = { ...d, chargers: [{ ...d.chargers![0]!, [field]: value }] };
			const parsed = parseBuildDocument(bad);
			expect(parsed.ok).toBe(false);
			if (!parsed.ok) expect(parsed.problems.map((p) => p.path)).toContain(`chargers.0.${field}`);
		}
	});
});
