import { formatDistanceToNow } from 'date-fns';
import { useLocalFormat, useMounted } from '@/lib/client/local-time';

/**
 * "3 minutes ago" / "in 6 days" once the island is awake; the date alone while the server renders
 * and the page hydrates, so the two agree however long the page took to wake (or however old the
 * copy the service worker kept). The exact local time is in the tooltip.
 */
export function RelativeTime({ at }: { at: string | Date }) {
	const mounted = useMounted();
	const fmtTime = useLocalFormat();
	const d = at instanceof Date ? at : new Date(at);
	if (Number.isNaN(d.getTime())) return <>—</>;
	return (
		<time dateTime={d.toISOString()} title={fmtTime(d, 'd MMM yyyy HH:mm')}>
			{mounted ? formatDistanceToNow(d, { addSuffix: true }) : `on ${fmtTime(d, 'd MMM yyyy')}`}
		</time>
	);
}
