/** A same-site path to return to after sign-in; anything else falls back to /teams. */
export function safeCallback(value: string | null | undefined, fallback = '/teams'): string {
	if (!value) return fallback;
	try {
		const url = new URL(value, 'http://x');
		if (url.origin !== 'http://x' && !/^https?:\/\/(127\.0\.0\.1|localhost)(:\d+)?\//.test(value))
			return fallback;
		const path = url.pathname + url.search;
		return path.startsWith('/') && !path.startsWith('//') ? path : fallback;
	} catch {
		return fallback;
	}
}
