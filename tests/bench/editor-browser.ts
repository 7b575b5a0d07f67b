/**
 * `npm run bench:browser`: what one edit costs in the browser. Bundles the engine with esbuild, loads
 * it into Debian's chromium (headless, playwright-core) and times the editor's recompute on a
 * 40-cable build — validation (zod schema + topology) and the report without time-stepping — after
 * changing one cable, as the build page does on every keystroke. Target: under 16 ms per edit.
 */
import { build } from 'esbuild';
import { DEMO_BUILDS } from '../../db/demo/builds';
import { openBrowser } from '../helpers/browser';
import { forty } from './fixtures';

const bundle = await build({
	stdin: {
		contents: `
			import { buildReport } from './src/engine/report';
			import { runBurp } from './src/engine/burp';
			import { parseBuildDocument } from './src/engine';
			window.sagwiseBench = (doc, edits) => {
				const times = [];
				for (let i = 0; i < edits; i++) {
					const next = structuredClone(doc);
					next.cables[i % next.cables.length].lengthM *= 1 + (i % 7) / 100;
					const t0 = performance.now();
					const parsed = parseBuildDocument(next);
					if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
					buildReport(parsed.doc, {}, { burpRun: false });
					times.push(performance.now() - t0);
				}
				const t1 = performance.now();
				runBurp(doc, { engineRpm: 1500, demand: 1, conductorTempC: 25, durationS: 10, stepS: 0.01 });
				return { times, burpMs: performance.now() - t1 };
			};`,
		resolveDir: process.cwd(),
		loader: 'ts',
	},
	bundle: true,
	format: 'iife',
	write: false,
	tsconfig: 'tsconfig.json',
});

const browser = await openBrowser();
try {
	await browser.page.goto('about:blank');
	await browser.page.addScriptTag({ content: bundle.outputFiles[0]!.text });
	const cases = { '40-cable build': forty(), ...DEMO_BUILDS };
	const rows = [];
	for (const [name, doc] of Object.entries(cases)) {
		const { times, burpMs } = await browser.page.evaluate(
			([d, n]) =>
				(
					window as unknown as {
						sagwiseBench: (d: unknown, n: number) => { times: number[]; burpMs: number };
					}
				).sagwiseBench(d, n),
			[doc, 300] as const,
		);
		const sorted = times.slice(20).sort((a, b) => a - b); // the first edits warm the JIT up
		const q = (p: number) => sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))]!;
		rows.push({
			case: `${name} (${doc.cables.length} cables)`,
			'edit median ms': q(0.5).toFixed(3),
			'edit p95 ms': q(0.95).toFixed(3),
			'burp 10 s/10 ms ms': burpMs.toFixed(1),
		});
	}
	console.table(rows);
	if (browser.problems.length) console.log('browser problems:', browser.problems);
} finally {
	await browser.close();
}
