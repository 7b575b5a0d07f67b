import { z } from '@/lib/zod';
import { MAX_MINOR } from '@/lib/money';
import type { Settlement } from '@/lib/settle-up';
import { lineText, notesText } from './text';

const day = z.iso.date({ error: 'Use a date like 2027-03-14' });
const minor = (what: string) =>
	z
		.number({ error: `${what} is a whole number of cents` })
		.int(`${what} is a whole number of cents`)
		.min(0, `${what} cannot be negative`)
		.max(MAX_MINOR, `${what} is too large`);

export const newSeasonSchema = z
	.object({
		name: lineText(80, { required: 'Name the season', maxMessage: 'Keep it under 80 characters' }),
		startsOn: day,
		endsOn: day,
		budgetMinor: minor('The budget'),
	})
	.refine((s) => s.endsOn >= s.startsOn, {
		path: ['endsOn'],
		message: 'The season cannot end before it starts',
	});
export type NewSeasonInput = z.infer<typeof newSeasonSchema>;

export const newPurchaseSchema = z.object({
	boughtOn: day,
	/** The shelf entry bought, when it is one (its name is kept as the item either way). */
	shelfItemId: z.uuid({ error: 'shelfItemId is a shelf entry’s id' }).nullable().default(null),
	item: lineText(200, { required: 'Say what was bought' }),
	quantity: z
		.number({ error: 'Quantity is a whole number' })
		.int('Quantity is a whole number')
		.min(1, 'At least 1')
		.max(10_000, 'At most 10 000'),
	unitPriceMinor: minor('The price'),
	/** The member who paid (an account id of this team). */
	paidBy: z.string({ error: 'Say who paid' }).min(1, 'Say who paid').max(100),
	notes: notesText(500).default(''),
});
export type NewPurchaseInput = z.infer<typeof newPurchaseSchema>;

export interface SeasonDto {
	id: string;
	name: string;
	startsOn: string;
	endsOn: string;
	budgetMinor: number;
	spentMinor: number;
}

export interface PurchaseDto {
	id: string;
	boughtOn: string;
	shelfItemId: string | null;
	item: string;
	quantity: number;
	unitPriceMinor: number;
	paidBy: string | null;
	paidByName: string;
	notes: string;
	/** The receipt photo's stored file, when one was added. */
	receiptFileId: string | null;
}

export interface CommittedPlanDto {
	id: string;
	name: string;
	vehicleId: string;
	vehicleName: string;
	totalMinor: number;
}

/** A season as its page and its API show it: purchases, the settling up, plans committed. */
export interface SeasonDetail {
	season: SeasonDto;
	purchases: PurchaseDto[];
	/** What each paying member (captains and members) paid against an even share. */
	settlement: Settlement;
	/** Plans not yet installed, with their parts' totals. */
	committed: CommittedPlanDto[];
	/** Who may be named as having paid: the team's captains and members. */
	payers: Array<{ id: string; name: string }>;
}
