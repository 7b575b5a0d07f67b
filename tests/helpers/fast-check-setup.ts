import fc from 'fast-check';

/**
 * Property tests repeat: one fixed seed unless SAGWISE_FC_FRESH=1 asks for new ones
 * (`npm run test:properties` runs them with fresh seeds many times). fast-check prints the seed
 * and the counterexample of any failure, so a failure found with a fresh seed can be replayed.
 */
const fresh = process.env.SAGWISE_FC_FRESH === '1';
fc.configureGlobal({
	...(fresh ? {} : { seed: Number(process.env.SAGWISE_FC_SEED ?? 20261202) }),
	numRuns: Number(process.env.SAGWISE_FC_RUNS ?? 100),
});
