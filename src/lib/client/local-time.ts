import { format } from 'date-fns';
import { useSyncExternalStore } from 'react';

const noop = () => () => {};

/** False while the server renders and while the page hydrates; true from then on. */
export function useMounted(): boolean {
	return useSyncExternalStore(
		noop,
		() => true,
		() => false,
	);
}

/** The date-fns format of an instant's UTC wall-clock time, the same in every time zone. */
function formatUtc(d: Date, pattern: string): string {
	return format(new Date(d.getTime() + d.getTimezoneOffset() * 60_000), pattern);
}

/**
 * Formats instants for an island: in UTC while the server renders and the page hydrates (so the
 * server's text and the browser's first render agree in any time zone), then in the browser's
 * own zone.
 */
export function useLocalFormat(): (at: string | number | Date, pattern: string) => string {
	const mounted = useMounted();
	return (at, pattern) => {
		const d = at instanceof Date ? at : new Date(at);
		if (Number.isNaN(d.getTime())) return '—';
		return mounted ? format(d, pattern) : formatUtc(d, pattern);
	};
}
