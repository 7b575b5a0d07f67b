import { useQuery } from '@tanstack/react-query';
import { format } from 'date-fns';
import { seasonsQueryOptions } from '@/lib/client/queries/seasons';

/**
 * Beside "Install": record the plan's parts as purchases in the season under way, paid by the
 * installer, in the same step. Shown only when a season is under way and the parts cost something.
 */
export function RecordPurchasesChoice({
	teamId,
	totalMinor,
	value,
	onChange,
}: {
	teamId: string;
	totalMinor: number;
	value: string | null;
	onChange: (seasonId: string | null) => void;
}) {
	const seasons = useQuery(seasonsQueryOptions(teamId));
	const today = format(new Date(), 'yyyy-MM-dd');
	const current = seasons.data?.find((s) => s.startsOn <= today && today <= s.endsOn);
	if (!current || totalMinor <= 0) return null;
	return (
		<label className="flex items-center gap-2 text-sm">
			<input
				type="checkbox"
				checked={value === current.id}
				onChange={(e) => onChange(e.target.checked ? current.id : null)}
			/>
			On install, record its parts as purchases in {current.name}, paid by you
		</label>
	);
}
