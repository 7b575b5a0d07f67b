import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import type { PurchaseDto, SeasonDto } from '@/lib/schemas/seasons';
import { findCommittedPlans, findPurchases } from '@/lib/server/db/seasons';
import { findMembers } from '@/lib/server/db/teams';
import { settleUp, type Settlement } from '@/lib/settle-up';

export interface SeasonDetail {
	season: SeasonDto;
	purchases: PurchaseDto[];
	/** What each paying member (captains and members) paid against an even share. */
	settlement: Settlement;
	/** Plans not yet installed, with their parts' totals. */
	committed: Awaited<ReturnType<typeof findCommittedPlans>>;
	/** Who may be named as having paid: the team's captains and members. */
	payers: Array<{ id: string; name: string }>;
}

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
