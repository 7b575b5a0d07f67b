/**
 * The signed-in member's id as the page states it (BaseLayout's body element), or null signed
 * out. What this device keeps (drafts, offline copies, waiting writes) is filed under it.
 */
export function pageUserId(): string | null {
	return typeof document === 'undefined' ? null : (document.body.dataset.userId ?? null);
}

/** The signed-in member's name as the page shows it (for "made by …" on a shared device). */
export function pageUserName(): string | null {
	return typeof document === 'undefined' ? null : (document.body.dataset.userName ?? null);
}

/**
 * The member the browser's session belongs to right now, asked of the server (the page may be
 * older than a sign-out or another member's sign-in in another tab): undefined when it cannot be
 * told (offline, server down), null when nobody is signed in.
 */
export async function liveUserId(): Promise<string | null | undefined> {
	try {
		const res = await fetch('/api/auth/session', {
			cache: 'no-store',
			credentials: 'same-origin',
			headers: { accept: 'application/json' },
		});
		if (!res.ok) return undefined;
		const body = (await res.json()) as { user?: { id?: string } } | null;
		return body?.user?.id ?? null;
	} catch {
		return undefined;
	}
}
