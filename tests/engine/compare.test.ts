import { describe, expect, it } from 'vitest';
import { marlinBuild } from '../../db/demo/builds';
import { voltageRatioDb } from '../../src/engine/amplifier';
import { comparePlans } from '../../src/engine/compare';
import { upgradeHints } from '../../src/engine/hints';
import { buildReport, DEFAULT_SCENARIO } from '../../src/engine/report';
import { runBurp } from '../../src/engine/burp';
import { solveNetwork } from '../../src/engine/solve';

const AT = { engineRpm: 1500, demand: 1, conductorTempC: 25 };
const lowestAt = (doc: typeof marlinBuild, demand: number) =>
	Math.min(...solveNetwork(doc, { ...AT, demand }).amplifiers.map((a) => a.terminalV));

describe('comparePlans', () => {
	const [first, second] = upgradeHints(marlinBuild, AT);
	const plans = [
		{ id: 'p1', name: first!.description, document: first!.document, cost: 400 },
		{ id: 'p2', name: second!.description, document: second!.document, cost: 250 },
	];
	const columns = comparePlans(marlinBuild, plans, { engineRpm: 1500, conductorTempC: 25 });

	it('puts the current build first and each plan after it', () => {
		expect(columns.map((c) => c.id)).toEqual(['current', 'p1', 'p2']);
		expect(columns[0]!.deltaDb).toBeCloseTo(0, 12);
	});

	it('gives the numbers of separate engine runs of each document', () => {
		for (const [i, doc] of [marlinBuild, plans[0]!.document, plans[1]!.document].entries()) {
			expect(columns[i]!.lowestAmplifierV.burp).toBeCloseTo(lowestAt(doc, 1), 9);
			expect(columns[i]!.lowestAmplifierV.sustained).toBeCloseTo(lowestAt(doc, 1 / 8), 9);
			const r = buildReport(doc, { engineRpm: 1500, conductorTempC: 25 }, { burpRun: false });
			expect(columns[i]!.warnings).toBe(r.ok ? r.warnings.length : -1);
			const run = runBurp(doc, {
				engineRpm: 1500,
				demand: 1,
				conductorTempC: 25,
				durationS: DEFAULT_SCENARIO.burpSeconds,
				stepS: DEFAULT_SCENARIO.burpStepS,
			});
			for (const a of columns[i]!.amplifiers)
				expect(a.burpRunMinV).toBeCloseTo(run.amplifierMinV[a.id]!, 9);
			// The time-stepped burp only sags from the steady burp point as the banks discharge.
			for (const a of columns[i]!.amplifiers)
				expect(a.burpRunMinV!).toBeLessThanOrEqual(a.burpV + 1e-9);
		}
	});

	it('expresses the gain as 20·log10 of the voltage ratio below the rated voltage, and per unit of money', () => {
		const p1 = columns[1]!;
		const expected = voltageRatioDb(p1.lowestAmplifierV.burp!, columns[0]!.lowestAmplifierV.burp!);
		expect(p1.deltaDb).toBeCloseTo(expected, 9);
		expect(p1.dbPerMoney).toBeCloseTo(expected / 400, 12);
	});
});

describe('comparePlans: cable heating and the engine speed at which the alternators keep up', () => {
	it('names each column’s hottest cable against its insulation and the first swept speed that needs no bank', async () => {
		const { speedSweep } = await import('../../src/engine/sweep');
		// A plan that thins the four-channel feed to 12 AWG: it runs hotter than anything in the build.
		const thin = structuredClone(marlinBuild);
		thin.cables.find((c) => c.id === 'mids_feed')!.size = { kind: 'awg', awg: '12' };
		const [current, plan] = comparePlans(
			marlinBuild,
			[{ id: 'thin', name: 'Thin feed', document: thin, cost: 0 }],
			{ engineRpm: 1500, conductorTempC: 25 },
		);
		const report = buildReport(thin, { engineRpm: 1500, conductorTempC: 25 }, { burpRun: false });
		if (!report.ok) throw new Error('does not solve');
		const hottest = report.cables.reduce((h, c) =>
			c.burpHeating.finalC - c.burpHeating.limitC > h.burpHeating.finalC - h.burpHeating.limitC
				? c
				: h,
		);
		expect(plan!.hottestCable).toEqual({
			label: hottest.label,
			finalC: hottest.burpHeating.finalC,
			limitC: hottest.burpHeating.limitC,
		});
		expect(plan!.hottestCable!.label).toBe('Four-channel feed');
		expect(plan!.hottestCable!.finalC).toBeGreaterThan(current!.hottestCable!.finalC);
		const sweep = speedSweep(marlinBuild, { engineRpm: 1500, conductorTempC: 25 });
		expect(current!.carriesMusicFromRpm).toBe(
			sweep.sustained.find((p) => !p.collapse && p.bankA <= 0.5)?.engineRpm ?? null,
		);
	});
});

describe('comparePlans and the banks', () => {
	it('shows what a bigger bank buys, where the single-point figures read the same', () => {
		// Doubling every bank's strings doubles its capacity (bankThevenin: C = Np·C_unit), so the
		// engine-off play time must grow and the session must end with more charge in hand.
		const bigger = structuredClone(marlinBuild);
		for (const b of bigger.banks) b.stringsInParallel *= 2;
		const [now, plan] = comparePlans(marlinBuild, [
			{ id: 'bank', name: 'Twice the bank', document: bigger, cost: 900 },
		]);
		expect(plan!.engineOffPlayS ?? Number.POSITIVE_INFINITY).toBeGreaterThan(now!.engineOffPlayS!);
		expect(plan!.session!.chargeLeftAh).toBeGreaterThan(now!.session!.chargeLeftAh);
		expect(plan!.session!.lastBurpV!).toBeGreaterThan(now!.session!.lastBurpV! - 1e-9);
	});
});
