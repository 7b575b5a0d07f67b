/**
 * `npm run test:properties [rounds]`: the engine's property tests with fresh seeds, many times
 * (CI runs them with one fixed seed so a random counterexample never turns it red by chance).
 * Prints each failing round's seed (from fast-check's report) and exits non-zero if any failed.
 */
import { spawnSync } from 'node:child_process';

const rounds = Number(process.argv[2] ?? 20);
let failed = 0;
for (let i = 1; i <= rounds; i++) {
	const run = spawnSync(
		'npx',
		['vitest', 'run', '--project', 'unit', 'tests/engine/network.test.ts'],
		{ encoding: 'utf8', env: { ...process.env, SAGWISE_FC_FRESH: '1' } },
	);
	const ok = run.status === 0;
	if (!ok) {
		failed++;
		const seed = /seed[^\d-]*(-?\d+)/i.exec(run.stdout + run.stderr)?.[1] ?? 'unknown';
		console.log(
			`round ${i}: FAILED (seed ${seed}); replay with SAGWISE_FC_SEED=${seed} npm run test:unit`,
		);
	} else console.log(`round ${i}: passed`);
}
console.log(`${rounds - failed} of ${rounds} rounds passed`);
process.exitCode = failed ? 1 : 0;
