import { useCallback, useEffect, useState } from 'react';

type DraftCheck = typeof import('./draft-check');

/**
 * The draft's field check (the build document's schema), loaded when it is first needed rather
 * than with the page: a saved revision, as first shown, was checked by the server, and the build
 * page is read far more often than it is edited. `want()` starts the load (on the first touch of
 * the editor, so it is there before the first keystroke); `check` is null until it has arrived.
 */
let loading: Promise<DraftCheck> | null = null;
let loaded: DraftCheck | null = null;

export function loadDraftCheck(): Promise<DraftCheck> {
	loading ??= import('./draft-check').then(
		(m) => (loaded = m),
		(error: unknown) => {
			loading = null;
			throw error;
		},
	);
	return loading;
}

export function useDraftCheck(): { check: DraftCheck | null; want: () => void } {
	// Null on the first render on both sides (the server render and hydration agree), then the
	// module as soon as it is in.
	const [check, setCheck] = useState<DraftCheck | null>(null);
	const want = useCallback(() => {
		if (check) return;
		if (loaded) return setCheck(loaded);
		// A failed load (offline before it was ever cached) is tried again on the next touch.
		loadDraftCheck().then(setCheck, () => undefined);
	}, [check]);
	useEffect(() => {
		if (loaded) setCheck(loaded);
	}, []);
	return { check, want };
}
