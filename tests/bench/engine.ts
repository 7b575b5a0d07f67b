/**
 * `npm run bench`: times the engine and prints median and p95 per case (tinybench).
 * Targets: a demo build's report (network solved at sustained and burp demand, budget at five
 * voltages, cable sizing and fuse advice) under 2 ms median; a 10 s burp at 10 ms steps under 50 ms.
 */
import { Bench } from 'tinybench';
import { DEMO_BUILDS } from '../../db/demo/builds';
import { buildReport, DEFAULT_SCENARIO } from '../../src/engine/report';
import { runBurp } from '../../src/engine/burp';
import { solveNetwork } from '../../src/engine/solve';
import type { BuildDocument } from '../../src/engine/types';
import { alternator, amp, bank, cable, doc, node } from '../helpers/networks';

/** A synthetic network with exactly 200 cables: a trunk of blocks, each with amplifiers and grounds. */
function synthetic200(): BuildDocument {
	const d = doc({ nodes: [node('gnd', 'chassis'), node('alt'), node('bat', 'battery')] });
	d.alternators.push(alternator('alt', 'alt', 'gnd', 600));
	d.banks.push(bank('front', 'bat', 'gnd', { stringsInParallel: 4 }));
	d.cables.push(cable('charge', 'alt', 'bat', { kind: 'awg', awg: '4/0' }, 1));
	let prev = 'bat';
	let i = 0;
	while (d.cables.length < 200) {
		i++;
		const blk = `blk${i}`;
		d.nodes.push(node(blk, 'block'), node(`a${i}p`, 'amplifier'), node(`a${i}n`, 'amplifier'));
		d.cables.push(cable(`run${i}`, prev, blk, { kind: 'awg', awg: '4/0' }, 0.5, { parallelRuns: 2 }));
		d.amplifiers.push(amp(`a${i}`, `a${i}p`, `a${i}n`, 40));
		d.cables.push(cable(`f${i}`, blk, `a${i}p`, { kind: 'awg', awg: '8' }, 1));
		if (d.cables.length < 200) d.cables.push(cable(`g${i}`, `a${i}n`, 'gnd', { kind: 'awg', awg: '8' }, 1));
		else d.cables.pop();
		if (d.cables.length < 200 && i % 10 === 0) {
			d.nodes.push(node(`b${i}`, 'battery'));
			d.banks.push(bank(`bank${i}`, `b${i}`, 'gnd'));
			d.cables.push(cable(`bl${i}`, `b${i}`, blk, { kind: 'awg', awg: '1/0' }, 0.5));
		}
		prev = blk;
	}
	while (d.cables.length > 200) d.cables.pop();
	// Any amplifier left without a ground gets one in place of its feed count.
	for (const a of d.amplifiers) if (!d.cables.some((c) => c.from === a.negative || c.to === a.negative)) d.amplifiers.splice(d.amplifiers.indexOf(a), 1);
	d.nodes = d.nodes.filter((n) => n.kind === 'chassis' || d.cables.some((c) => c.from === n.id || c.to === n.id) || d.banks.some((b) => b.positive === n.id) || d.alternators.some((a) => a.positive === n.id));
	return d;
}

/** A 40-cable build: the size the editor must recompute on every keystroke (target < 16 ms). */
function forty(): BuildDocument {
	const d = doc({ nodes: [node('gnd', 'chassis'), node('alt'), node('bat', 'battery'), node('blk', 'block')] });
	d.alternators.push(alternator('alt', 'alt', 'gnd', 300));
	d.banks.push(bank('front', 'bat', 'gnd', { stringsInParallel: 2 }));
	d.cables.push(cable('charge', 'alt', 'bat', { kind: 'awg', awg: '1/0' }, 1), cable('run', 'bat', 'blk', { kind: 'awg', awg: '1/0' }, 5, { parallelRuns: 2 }));
	for (let i = 1; d.cables.length < 40; i++) {
		d.nodes.push(node(`p${i}`, 'amplifier'), node(`n${i}`, 'amplifier'));
		d.amplifiers.push(amp(`a${i}`, `p${i}`, `n${i}`, 150));
		d.cables.push(cable(`f${i}`, 'blk', `p${i}`, { kind: 'awg', awg: '4' }, 1.5), cable(`g${i}`, `n${i}`, 'gnd', { kind: 'awg', awg: '4' }, 1));
	}
	return d;
}

const bench = new Bench({ time: 1500, warmupTime: 300, retainSamples: true });
for (const [name, d] of Object.entries(DEMO_BUILDS)) {
	bench.add(`report, no time-stepping: ${name}`, () => void buildReport(d, {}, { burpRun: false }));
	bench.add(`burp 10 s at 10 ms: ${name}`, () => void runBurp(d, { engineRpm: DEFAULT_SCENARIO.engineRpm, demand: 1, conductorTempC: 25, durationS: 10, stepS: 0.01 }));
	bench.add(`full report with burp: ${name}`, () => void buildReport(d));
}
const fortyCables = forty();
bench.add(`editor recompute (report, no time-stepping): ${fortyCables.cables.length} cables`, () => void buildReport(fortyCables, {}, { burpRun: false }));
bench.add(`editor deferred burp: ${fortyCables.cables.length} cables`, () => void runBurp(fortyCables, { engineRpm: 1500, demand: 1, conductorTempC: 25, durationS: 10, stepS: 0.01 }));
const big = synthetic200();
const bigCheck = solveNetwork(big, { engineRpm: 1500, demand: 1, conductorTempC: 25 });
bench.add(`one network solve: synthetic ${big.cables.length} cables / ${big.nodes.length} nodes`, () => void solveNetwork(big, { engineRpm: 1500, demand: 1, conductorTempC: 25 }));
bench.add(`report, no time-stepping: synthetic ${big.cables.length} cables`, () => void buildReport(big, {}, { burpRun: false }));

await bench.run();
const rows = bench.tasks.map((t) => {
	const r = t.result as { latency?: { p50?: number; p99?: number; samples?: number[] }; samples?: number[] } | undefined;
	const samples = [...(r?.latency?.samples ?? r?.samples ?? [])].sort((a, b) => a - b);
	const q = (p: number) => samples[Math.min(samples.length - 1, Math.floor(p * samples.length))] ?? Number.NaN;
	return { case: t.name, 'median ms': q(0.5).toFixed(3), 'p95 ms': q(0.95).toFixed(3), runs: samples.length };
});
console.table(rows);
console.log(`synthetic network solved: ${bigCheck.status}, ${bigCheck.iterations} Newton iterations`);
