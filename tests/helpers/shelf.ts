import { pebbleBuild } from '../../db/demo/builds';
import { shelfSpecOf } from '../../src/lib/shelf-kinds';

export { shelfSpecOf as specFrom };

/** A shelf entry for a battery bank, from the demo's own. */
export const shelfBank = (over: Record<string, unknown> = {}) => ({
	kind: 'banks' as const,
	label: 'Spare lithium bank',
	spec: shelfSpecOf('banks', pebbleBuild.banks[0]!),
	priceMinor: 45_995,
	supplier: 'Across town',
	link: '',
	owned: 1,
	notes: '',
	...over,
});
