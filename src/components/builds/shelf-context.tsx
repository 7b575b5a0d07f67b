import { useQuery } from '@tanstack/react-query';
import { createContext, useEffect } from 'react';
import type { PartGroup } from '@/engine/browser';
import { shelfQueryOptions } from '@/lib/client/queries/shelf';
import { minorToText } from '@/lib/money';
import { priceUnit, SHELF_GROUP, type ShelfItemDto } from '@/lib/shelf-kinds';

/**
 * Where the add-part form finds the team's shelf, and who hears of a part started from an entry
 * (a plan adds the entry to its parts to buy). Without a provider the form offers no shelf.
 */
export interface ShelfPick {
	teamId: string;
	onPick?: (entry: ShelfItemDto, part: Record<string, unknown>) => void;
}

export const ShelfContext = createContext<ShelfPick | null>(null);

/** The shelf's entries that place as parts of this group (asked for once the form opens). */
function useShelfFor(teamId: string, group: PartGroup) {
	const query = useQuery(shelfQueryOptions(teamId));
	return {
		entries: (query.data ?? []).filter((x) => SHELF_GROUP[x.kind] === group),
		loading: query.isPending,
	};
}

/**
 * The add form's "start from the team's shelf": a choice among the shelf's entries of the kind,
 * each with its price and how many the team has; nothing is shown when the shelf has none.
 */
export function ShelfPicker({
	id,
	teamId,
	group,
	noun,
	picked,
	onPicked,
	carriesPrice,
}: {
	id: string;
	teamId: string;
	group: PartGroup;
	noun: string;
	picked: ShelfItemDto | null;
	onPicked: (entry: ShelfItemDto | null) => void;
	carriesPrice: boolean;
}) {
	const { entries, loading } = useShelfFor(teamId, group);
	if (!loading && entries.length === 0) return null;
	return (
		<div className="flex min-w-0 flex-col gap-1">
			<label htmlFor={id} className="text-sm font-semibold">
				Start from the team’s shelf
			</label>
			<select
				id={id}
				value={picked?.id ?? ''}
				disabled={loading}
				onChange={(e) => onPicked(entries.find((x) => x.id === e.target.value) ?? null)}
				className="w-full min-w-0 rounded-md border border-hairline bg-card px-3 py-2 sm:max-w-xl"
			>
				<option value="">
					{loading ? 'Reading the shelf…' : `A new ${noun} with default figures`}
				</option>
				{entries.map((x) => (
					<option key={x.id} value={x.id}>
						{x.label}
						{x.priceMinor === null ? '' : ` · ${minorToText(x.priceMinor)} ${priceUnit(x.kind)}`}
						{x.owned ? ` · ${x.owned} on hand` : ''}
					</option>
				))}
			</select>
			{picked && picked.priceMinor !== null && carriesPrice && (
				<p className="text-xs text-ink-soft">
					Its price ({minorToText(picked.priceMinor)} {priceUnit(picked.kind)}) goes into the plan’s
					parts to buy.
				</p>
			)}
		</div>
	);
}

/** Reads the team's shelf and hands its entries up (renders nothing): for prices beside a ranking. */
export function ShelfLoader({
	teamId,
	onEntries,
}: {
	teamId: string;
	onEntries: (entries: ShelfItemDto[]) => void;
}) {
	const query = useQuery(shelfQueryOptions(teamId));
	useEffect(() => {
		if (query.data) onEntries(query.data);
	}, [query.data, onEntries]);
	return null;
}
