/** The service worker's caches of pages and data (see astro.config.mjs), by name. */
const PRIVATE_CACHES = ['sagwise-pages', 'sagwise-data'];

/**
 * Forgets the pages and data kept for offline use: they belong to whoever was signed in. The
 * outbox of unsent writes is kept; it goes out when its author signs in again.
 */
export async function forgetOfflineCopies(): Promise<void> {
	if (typeof caches === 'undefined') return;
	await Promise.all(PRIVATE_CACHES.map((name) => caches.delete(name)));
}
