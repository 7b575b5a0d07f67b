/**
 * `npm run bench`: times the engine and prints median and p95 per case (tinybench).
 * Targets: a demo build's report (network solved at sustained and burp demand, budget at five
 * voltages, cable sizing and fuse advice) under 2 ms median; a 10 s burp at 10 ms steps under 50 ms.
 */
import { Bench } from 'tinybench';
import { DEMO_BUILDS } from '../../db/demo/builds';
import { buildReport, DEFAULT_SCENARIO } from '../../src/engine/report';
import { runBurp } from '../../src/engine/burp';
import { engineOffPlayTime, runSession } from '../../src/engine/session';
import { solveNetwork } from '../../src/engine/solve';
import { comparePlans } from '../../src/engine/compare';
import { upgradeHints } from '../../src/engine/hints';
import { mergePlan } from '../../src/engine/merge';
import { DEMO_PLANS } from '../../db/demo/plans';
import { applyCalibration, calibrateFromRun } from '../../src/engine/calibrate';
import { forty, synthetic200, syntheticNetwork } from './fixtures';

const bench = new Bench({ time: 1500, warmupTime: 300, retainSamples: true });
for (const [name, d] of Object.entries(DEMO_BUILDS)) {
	bench.add(`report, no time-stepping: ${name}`, () => void buildReport(d, {}, { burpRun: false }));
	bench.add(
		`burp 10 s at 10 ms: ${name}`,
		() =>
			void runBurp(d, {
				engineRpm: DEFAULT_SCENARIO.engineRpm,
				demand: 1,
				conductorTempC: 25,
				durationS: 10,
				stepS: 0.01,
			}),
	);
	bench.add(`full report with burp: ${name}`, () => void buildReport(d));
}
const fortyCables = forty();
bench.add(
	`editor recompute (report, no time-stepping): ${fortyCables.cables.length} cables`,
	() => void buildReport(fortyCables, {}, { burpRun: false }),
);
bench.add(
	`editor deferred burp: ${fortyCables.cables.length} cables`,
	() =>
		void runBurp(fortyCables, {
			engineRpm: 1500,
			demand: 1,
			conductorTempC: 25,
			durationS: 10,
			stepS: 0.01,
		}),
);
const big = synthetic200();
const bigCheck = solveNetwork(big, { engineRpm: 1500, demand: 1, conductorTempC: 25 });
// The plans page: the current build and three plans, answered by the compare route; four 10 s
// time-stepped burps dominate (target < 250 ms, shown behind a loading state).
const oakPlans = DEMO_PLANS.map((p, i) => ({
	id: String(i),
	name: p.name,
	document: p.document,
	cost: 1000,
}));
bench.add(
	'plan comparison: Old Oak and three plans',
	() => void comparePlans(DEMO_BUILDS['Old Oak'], [...oakPlans, { ...oakPlans[0]!, id: '2' }]),
);
bench.add(
	'upgrade hints: Old Oak',
	() =>
		void upgradeHints(DEMO_BUILDS['Old Oak'], { engineRpm: 1500, demand: 1, conductorTempC: 25 }),
);
bench.add(
	'plan merge onto a newer head: Old Oak',
	() => void mergePlan(DEMO_BUILDS['Old Oak'], DEMO_PLANS[1]!.document, DEMO_PLANS[0]!.document),
);

bench.add(
	`one network solve: synthetic ${big.cables.length} cables / ${big.nodes.length} nodes`,
	() => void solveNetwork(big, { engineRpm: 1500, demand: 1, conductorTempC: 25 }),
);
bench.add(
	`report, no time-stepping: synthetic ${big.cables.length} cables`,
	() => void buildReport(big, {}, { burpRun: false }),
);

// A whole session: 10 burps of 30 s with 60 s rests at 10 ms steps (90,000 solves), run in the
// build page's worker (target < 1.5 s); the build page's default session (target < 50 ms) and
// the engine-off play time (target < 50 ms).
const oak = DEMO_BUILDS['Old Oak'];
bench.add(
	'session 10 × 30 s burps, 60 s rests at 10 ms: Old Oak',
	() => void runSession(oak, { burps: 10, burpS: 30, restS: 60, stepS: 0.01, restStepS: 0.01 }),
);
bench.add('default session (5 × 10 s burps): Old Oak', () => void runSession(oak));
bench.add(
	'engine-off play time to the cut-off: Old Oak',
	() => void engineOffPlayTime(oak, { demand: 1 / 8, conductorTempC: 25, cutoffV: null }),
);

// Calibration: fitting bank resistance and alternator output to a 81-sample log made by the
// engine from the Marlin build with both changed (target < 500 ms, in the run page's worker).
const marlin = DEMO_BUILDS.Marlin;
const tired = applyCalibration(
	marlin,
	{ bankResistance: 1.4, alternatorOutput: 0.85, connectionMilliohm: 0 },
	undefined,
);
const log = Array.from({ length: 81 }, (_, i) => {
	const s = solveNetwork(tired, {
		engineRpm: 1500,
		demand: 0.05 + 0.95 * Math.abs(Math.sin((i / 80) * Math.PI)),
		conductorTempC: 25,
	});
	return {
		tS: i * 0.1,
		volts: Math.min(...s.amplifiers.map((a) => a.terminalV)),
		amps: s.amplifiers.reduce((t, a) => t + a.currentA, 0),
	};
});
bench.add(
	'calibration fit (bank resistance, alternator output) to an 81-sample log: Marlin',
	() =>
		void calibrateFromRun(marlin, log, {
			engineRpm: 1500,
			conductorTempC: 25,
			fit: ['bankResistance', 'alternatorOutput'],
		}),
);

// How a solve grows with the network: the sparse factorisation should keep it near linear
// (target: exponent ≤ 1.5 between 500 and 2,000 cables).
const SCALE = [500, 1000, 2000] as const;
for (const count of SCALE) {
	const d = syntheticNetwork(count);
	bench.add(
		`one network solve: synthetic ${count} cables`,
		() => void solveNetwork(d, { engineRpm: 1500, demand: 1, conductorTempC: 25 }),
	);
}

await bench.run();
const rows = bench.tasks.map((t) => {
	const r = t.result as
		| { latency?: { p50?: number; p99?: number; samples?: number[] }; samples?: number[] }
		| undefined;
	const samples = [...(r?.latency?.samples ?? r?.samples ?? [])].sort((a, b) => a - b);
	const q = (p: number) =>
		samples[Math.min(samples.length - 1, Math.floor(p * samples.length))] ?? Number.NaN;
	return {
		case: t.name,
		'median ms': q(0.5).toFixed(3),
		'p95 ms': q(0.95).toFixed(3),
		runs: samples.length,
	};
});
console.table(rows);
const scaleMs = SCALE.map((count) =>
	Number(
		rows.find((r) => r.case === `one network solve: synthetic ${count} cables`)?.['median ms'],
	),
);
const exponent = Math.log(scaleMs[2]! / scaleMs[0]!) / Math.log(SCALE[2] / SCALE[0]);
console.log(
	`solve time grows as n^${exponent.toFixed(2)} from ${SCALE[0]} to ${SCALE[2]} cables (target ≤ n^1.5)`,
);
console.log(
	`synthetic network solved: ${bigCheck.status}, ${bigCheck.iterations} Newton iterations`,
);
