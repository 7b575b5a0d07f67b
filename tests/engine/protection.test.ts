import { describe, expect, it } from 'vitest';
import { cableResistanceOhm } from '../../src/engine/conductors';
import { parseBuildDocument } from '../../src/engine/document-schema';
import { buildReport } from '../../src/engine/report';
import { solveNetwork } from '../../src/engine/solve';
import { toSpiceNetlist } from '../../src/engine/spice';
import type { BuildDocument, Fuse } from '../../src/engine/types';
import { alternator, bank, cable, doc, node, steady } from '../helpers/networks';

const FT = 0.3048;
const AT = { engineRpm: 1000, demand: 1, conductorTempC: 20 };

/** A stiff source feeding a 100 A steady load through 10 ft of 4 AWG out and back. */
function feed(fuses: Fuse[]): BuildDocument {
	return doc({
		nodes: [node('gnd', 'chassis'), node('src'), node('lp'), node('ln')],
		alternators: [
			alternator('alt', 'src', 'gnd', 5000, { setPointV: 14, sourceResistanceOhm: 1e-6 }),
		],
		loads: [steady('l', 'lp', 'ln', 100)],
		cables: [
			cable('pos', 'src', 'lp', { kind: 'awg', awg: '4' }, 10 * FT, { fuses }),
			cable('neg', 'ln', 'gnd', { kind: 'awg', awg: '4' }, 10 * FT),
		],
	});
}

const fuse = (over: Partial<Fuse> = {}): Fuse => ({
	ratingA: 150,
	end: 'from',
	distanceM: 0.2,
	...over,
});

describe('inline protection with resistance', () => {
	it('adds each holder’s contacts in series with the cable (resistances in series add)', () => {
		const bare = cableResistanceOhm(feed([]).cables[0]!, 20);
		const held = cableResistanceOhm(
			feed([
				fuse({ contactResistanceOhm: 0.0003 }),
				fuse({ end: 'to', device: 'breaker', contactResistanceOhm: 0.0002 }),
			]).cables[0]!,
			20,
		);
		expect(held - bare).toBeCloseTo(0.0005, 12);
	});

	it('drops I·R more across a holder at the same current (Ohm’s law, Kirchhoff’s voltage law)', () => {
		// A steady 100 A load draws 100 A whatever its voltage: a 0.4 mΩ holder adds 40 mV of drop
		// on the cable that carries it and nothing elsewhere.
		const without = solveNetwork(feed([fuse()]), AT);
		const withHolder = solveNetwork(feed([fuse({ contactResistanceOhm: 0.0004 })]), AT);
		// (the solver's minimum conductance across each node leaks nanoamperes: 6 decimals)
		expect(without.cables[0]!.currentA).toBeCloseTo(100, 6);
		expect(withHolder.cables[0]!.dropV - without.cables[0]!.dropV).toBeCloseTo(0.04, 8);
		expect(withHolder.cables[1]!.dropV).toBeCloseTo(without.cables[1]!.dropV, 12);
		// and loses I²·R in it: 100² × 0.0004 = 4 W
		expect(withHolder.cables[0]!.lossW - without.cables[0]!.lossW).toBeCloseTo(4, 6);
	});

	it('writes the holder into the SPICE netlist’s cable resistance', () => {
		const r = cableResistanceOhm(feed([fuse({ contactResistanceOhm: 0.0004 })]).cables[0]!, 20);
		const netlist = toSpiceNetlist(feed([fuse({ contactResistanceOhm: 0.0004 })]), AT).netlist;
		const lines = netlist.split('\n').filter((l) => /^r/i.test(l));
		expect(lines.some((l) => Math.abs(Number(l.split(/\s+/)[3]) - r) < 1e-9)).toBe(true);
	});

	it('sizes and checks a breaker as a fuse, and names it a breaker', () => {
		// 4 AWG at 105 °C: 160 A in the report's ampacity table (33 CFR 183.425 Table 5), so protection
		// above 240 A (150 %, 33 CFR 183.455(c)) fails to protect it, a breaker as a fuse.
		const d: BuildDocument = doc({
			nodes: [node('bat', 'battery'), node('lp'), node('gnd', 'chassis')],
			banks: [bank('b', 'bat', 'gnd')],
			loads: [steady('l', 'lp', 'gnd', 20)],
			cables: [
				cable('run', 'bat', 'lp', { kind: 'awg', awg: '4' }, 2, {
					fuses: [fuse({ ratingA: 250, device: 'breaker', distanceM: 0.1 })],
				}),
			],
		});
		const asFuse = structuredClone(d);
		delete asFuse.cables[0]!.fuses[0]!.device;
		const codes = (x: BuildDocument) => {
			const r = buildReport(x, {}, { burpRun: false });
			if (!r.ok) throw new Error('does not solve');
			return r.warnings.filter((w) => w.code.startsWith('fuse'));
		};
		expect(codes(d).map((w) => w.code)).toEqual(codes(asFuse).map((w) => w.code));
		const above = codes(d).find((w) => w.code === 'fuse_above_capacity');
		expect(above?.message).toMatch(/250 A breaker on "run"/);
		expect(codes(asFuse).find((w) => w.code === 'fuse_above_capacity')?.message).toMatch(
			/250 A fuse on "run"/,
		);
	});

	it('refuses a holder past 10 mΩ and an unknown kind of protection, by field', () => {
		const bad = feed([fuse({ contactResistanceOhm: 0.02, device: 'relay' as Fuse['device'] })]);
		const parsed = parseBuildDocument(bad);
		expect(parsed.ok).toBe(false);
		if (parsed.ok) return;
		const paths = parsed.problems.map((p) => p.path);
		expect(paths).toContain('cables.0.fuses.0.contactResistanceOhm');
		expect(paths).toContain('cables.0.fuses.0.device');
	});
});
