import { startTransition, useEffect, useState } from 'react';

/**
 * A value that follows `value` once the browser has painted the change that brought it, and then
 * at transition priority (rendered in slices React can interrupt). What the member is typing into
 * and the summary paint first; long tables and charts catch up after, never in the way.
 */
export function useAfterPaint<T>(value: T): T {
	const [shown, setShown] = useState(value);
	useEffect(() => {
		let timer: ReturnType<typeof setTimeout> | undefined;
		const frame = requestAnimationFrame(() => {
			timer = setTimeout(() => startTransition(() => setShown(value)), 0);
		});
		return () => {
			cancelAnimationFrame(frame);
			if (timer !== undefined) clearTimeout(timer);
		};
	}, [value]);
	return shown;
}
