import { useEffect, useRef, useState, type RefObject, type SyntheticEvent } from 'react';

/**
 * Open state of a server-rendered `<details>`. A tap on its summary before the island wakes opens
 * it natively and fires `toggle` before React listens, so the state is read back from the element
 * once mounted. `remembered` is this browser's earlier choice (null: none); `onChange` hears every
 * change, including the one caught on mount.
 */
export function useDetailsOpen(
	remembered: () => boolean | null = () => null,
	onChange?: (open: boolean) => void,
): {
	ref: RefObject<HTMLDetailsElement | null>;
	open: boolean;
	onToggle: (e: SyntheticEvent<HTMLDetailsElement>) => void;
} {
	const ref = useRef<HTMLDetailsElement | null>(null);
	const [open, setOpen] = useState(false);
	const changed = useRef(onChange);
	changed.current = onChange;
	const first = useRef(remembered);
	useEffect(() => {
		if (ref.current?.open) {
			setOpen(true);
			changed.current?.(true);
			return;
		}
		if (first.current() === true) setOpen(true);
	}, []);
	return {
		ref,
		open,
		onToggle: (e) => {
			const now = e.currentTarget.open;
			setOpen(now);
			changed.current?.(now);
		},
	};
}
