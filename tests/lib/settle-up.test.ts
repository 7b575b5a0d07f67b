import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { settleUp } from '../../src/lib/settle-up';

/**
 * Settling up in whole cents. The rules checked are arithmetic (no published source needed): an
 * even share of a total, balances that sum to zero, transfers that clear every balance.
 */
describe('settling up a season', () => {
	const people = fc.uniqueArray(fc.stringMatching(/^[a-z]{1,6}$/), { minLength: 1, maxLength: 8 });

	it('balances always sum to zero and shares to the total, whoever paid (property)', () => {
		fc.assert(
			fc.property(
				people,
				fc.array(fc.tuple(fc.nat(12), fc.integer({ min: 0, max: 10_000_000 })), { maxLength: 40 }),
				(ids, raw) => {
					const members = ids.map((id) => ({ id, name: id.toUpperCase() }));
					// Index past the members: someone who left the team paid it.
					const payments = raw.map(([who, amountMinor]) => ({
						paidBy: who < ids.length ? ids[who]! : null,
						paidByName: who < ids.length ? ids[who]!.toUpperCase() : `Former ${who}`,
						amountMinor,
					}));
					const s = settleUp(members, payments);
					const total = payments.reduce((n, p) => n + p.amountMinor, 0);
					expect(s.totalMinor).toBe(total);
					expect(s.lines.reduce((n, l) => n + l.balanceMinor, 0)).toBe(0);
					expect(s.lines.reduce((n, l) => n + l.shareMinor, 0)).toBe(total);
					// Shares differ by at most one cent.
					const shares = s.lines.filter((l) => ids.includes(l.id)).map((l) => l.shareMinor);
					expect(Math.max(...shares) - Math.min(...shares)).toBeLessThanOrEqual(1);
					// The transfers settle every balance.
					const after = new Map(s.lines.map((l) => [l.name, l.balanceMinor]));
					for (const t of s.transfers) {
						expect(t.amountMinor).toBeGreaterThan(0);
						after.set(t.from, after.get(t.from)! + t.amountMinor);
						after.set(t.to, after.get(t.to)! - t.amountMinor);
					}
					for (const v of after.values()) expect(v).toBe(0);
				},
			),
		);
	});

	it('splits 100.00 three ways as 33.34, 33.33, 33.33 and says who pays whom', () => {
		const s = settleUp(
			[
				{ id: 'a', name: 'Ana' },
				{ id: 'b', name: 'Ben' },
				{ id: 'c', name: 'Cy' },
			],
			[{ paidBy: 'a', paidByName: 'Ana', amountMinor: 10_000 }],
		);
		expect(s.lines.map((l) => l.shareMinor)).toEqual([3334, 3333, 3333]);
		expect(s.transfers).toEqual([
			{ from: 'Ben', to: 'Ana', amountMinor: 3333 },
			{ from: 'Cy', to: 'Ana', amountMinor: 3333 },
		]);
	});
});
