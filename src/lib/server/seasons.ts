import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import type { SeasonDetail, SeasonDto } from '@/lib/schemas/seasons';
import { findCommittedPlans, findPurchases } from '@/lib/server/db/seasons';
import { findMembers } from '@/lib/server/db/teams';
import { settleUp } from '@/lib/settle-up';

/** A season as its page and its API show it: purchases, the settling up, plans committed. */
export async function seasonDetail(
	db: Kysely<Database>,
	teamId: string,
	season: SeasonDto,
): Promise<SeasonDetail> {
	const [purchases, members, committed] = await Promise.all([
		findPurchases(db, season.id),
		findMembers(db, teamId),
		findCommittedPlans(db, teamId),
	]);
	const payers = members
		.filter((m) => m.role !== 'viewer')
		.map((m) => ({ id: m.userId, name: m.name || m.email }));
	const settlement = settleUp(
		payers,
		purchases.map((p) => ({
			paidBy: p.paidBy,
			paidByName: p.paidByName,
			amountMinor: p.quantity * p.unitPriceMinor,
		})),
	);
	return { season, purchases, settlement, committed, payers };
}
