import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildReport, EngineInputError, GMIN_S, solveNetwork } from '../../src/engine';
import type { BuildDocument } from '../../src/engine/types';
import { alternator, bank, cable, doc, node, randomNetwork } from '../helpers/networks';

/**
 * Kirchhoff's current law at every node, with the solver's background conductance to the chassis
 * (GMIN_S, as SPICE's gmin) counted as the element it is. Returns the worst imbalance relative to
 * the current through that node, counted as no less than 10 A: in double precision a 1 µΩ part
 * at 14 V resolves its current only to about 2e-9 A (one unit in the last place of the voltage
 * over its resistance), so no solver can hold a smaller absolute imbalance there.
 */
function kirchhoffRelative(d: BuildDocument, s: ReturnType<typeof solveNetwork>): number {
	const sum = new Map<string, number>(d.nodes.map((n) => [n.id, 0]));
	const through = new Map<string, number>(d.nodes.map((n) => [n.id, 0]));
	const add = (id: string, a: number) => {
		sum.set(id, sum.get(id)! + a);
		through.set(id, through.get(id)! + Math.abs(a));
	};
	d.cables.forEach((c, i) => {
		add(c.from, -s.cables[i]!.currentA);
		add(c.to, s.cables[i]!.currentA);
	});
	const twoTerminal = (
		parts: { positive: string; negative: string }[],
		results: { currentA: number }[],
		out: 1 | -1,
	) =>
		parts.forEach((p, i) => {
			add(p.positive, out * results[i]!.currentA);
			add(p.negative, -out * results[i]!.currentA);
		});
	twoTerminal(d.banks, s.banks, 1);
	twoTerminal(d.alternators, s.alternators, 1);
	twoTerminal(d.amplifiers, s.amplifiers, -1);
	twoTerminal(d.loads, s.loads, -1);
	const chassis = d.nodes.find((n) => n.kind === 'chassis')!.id;
	let worst = 0;
	for (const [id, a] of sum) {
		if (id === chassis) continue;
		const leak = GMIN_S * s.nodeVoltages[id]!;
		worst = Math.max(worst, Math.abs(a - leak) / Math.max(10, through.get(id)!));
	}
	return worst;
}

/** Values at the schema's floor and ceiling, and ordinary ones between. */
const edge = <T>(...xs: T[]) => fc.constantFrom(...xs);

const extremes = fc.record({
	seed: fc.integer({ min: 1, max: 2 ** 31 - 1 }),
	altOhm: edge(1e-6, 2e-6, 3e-6, 1e-5, 1e-4, 0.1, 1),
	setPointV: edge(13.6, 14.4, 15.5, 20, 1, 12),
	altLimitA: edge(0.5, 80, 350, 2000),
	soc: edge(0, 0.02, 0.5, 0.99, 1),
	bankOhm: edge(1e-6, 1e-4, 0.003, 0.5, 1),
	maxChargeC: edge(null, 0.01, 10),
	joints: edge(0, 1e-6, 1),
	ampScale: edge(0.001, 1, 5, 50),
	engineRpm: edge(0, 800, 1500, 6000),
	demand: edge(1 / 8, 1),
});

type Extremes = typeof extremes extends fc.Arbitrary<infer T> ? T : never;

function extremeNetwork(x: Extremes): BuildDocument {
	const d = randomNetwork(x.seed);
	return {
		...d,
		alternators: d.alternators.map((a) => ({
			...a,
			sourceResistanceOhm: x.altOhm,
			setPointV: x.setPointV,
			ratedHotA: x.altLimitA,
			curve: [{ rpm: 0, currentA: x.altLimitA }],
		})),
		banks: d.banks.map((b, i) => ({
			...b,
			stateOfCharge: i === 0 ? x.soc : b.stateOfCharge,
			unitResistanceOhm: i === 0 ? x.bankOhm : b.unitResistanceOhm,
			maxChargeC: x.maxChargeC,
		})),
		amplifiers: d.amplifiers.map((a) => ({
			...a,
			ratedPowerW: Math.min(100_000, a.ratedPowerW * x.ampScale),
		})),
		cables: d.cables.map((c, i) => (i % 3 === 0 ? { ...c, connectionResistanceOhm: x.joints } : c)),
	};
}

describe('every schema-valid document solves or is refused by name', () => {
	it('solves with Kirchhoff’s current law to 1e-9, reports a collapse, or names the path', () => {
		fc.assert(
			fc.property(extremes, (x) => {
				const d = extremeNetwork(x);
				const conditions = { engineRpm: x.engineRpm, demand: x.demand, conductorTempC: 25 };
				let s: ReturnType<typeof solveNetwork>;
				try {
					s = solveNetwork(d, conditions);
				} catch (e) {
					// A refusal must be the typed one, naming where.
					expect(e).toBeInstanceOf(EngineInputError);
					expect((e as EngineInputError).problems.length).toBeGreaterThan(0);
					return;
				}
				// At a collapse the voltages are those of the last stable fraction: the law holds there too.
				expect(kirchhoffRelative(d, s)).toBeLessThan(1e-9);
				for (const v of Object.values(s.nodeVoltages)) expect(Number.isFinite(v)).toBe(true);
				// The report solves the same build at its own conditions (burp, music, engine off, the
				// time-stepped burp): it must answer too, a collapse being one of its findings.
				const r = buildReport(d, { engineRpm: x.engineRpm });
				expect(r.ok).toBe(true);
				if (s.status === 'collapse' && r.ok && x.demand === 1)
					expect(r.warnings.some((w) => w.code === 'voltage_collapse')).toBe(true);
			}),
			{ numRuns: 300 },
		);
	}, 60_000);

	// The case that once threw a bare Error: a 1 µΩ alternator at its limit and a full bank that
	// accepts no charge. Every source sits at a limit, so the Newton step sees only the 1 nS
	// background conductance (a step of ~1e11 V). Hand computation: with no load the alternator
	// must settle at its set point (its current falls to what the leaks to chassis take).
	it.each([1e-6, 2e-6, 3e-6])(
		'settles at the set point with a %f Ω alternator and a full bank',
		(r) => {
			const d = doc({
				nodes: [node('gnd', 'chassis'), node('p')],
				alternators: [alternator('alt', 'p', 'gnd', 150, { sourceResistanceOhm: r })],
				banks: [bank('b', 'p', 'gnd', { stateOfCharge: 1 })],
				cables: [],
			});
			const s = solveNetwork(d, { engineRpm: 1500, demand: 0, conductorTempC: 20 });
			expect(s.status).toBe('ok');
			expect(s.nodeVoltages.p).toBeCloseTo(14.4, 4);
			void cable;
		},
	);
});
