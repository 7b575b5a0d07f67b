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

/**
 * Tells the service worker who is signed in on this device (null: nobody). It keeps pages and data
 * only for that member, and deletes what it kept for anyone else when this changes. Resolves once
 * the worker has it (or at once when there is no worker).
 */
export async function tellServiceWorkerWho(userId: string | null): Promise<void> {
	if (typeof navigator === 'undefined' || !('serviceWorker' in navigator)) return;
	const message = { type: 'sagwise-user', id: userId };
	const send = (worker: ServiceWorker | null | undefined) =>
		new Promise<void>((resolve) => {
			if (!worker) return resolve();
			const channel = new MessageChannel();
			const done = setTimeout(resolve, 2000);
			channel.port1.onmessage = () => {
				clearTimeout(done);
				resolve();
			};
			worker.postMessage(message, [channel.port2]);
		});
	// The controlling worker now (a sign-out must reach it before the page leaves), and the active
	// one once registration is ready (a first visit has no controller yet).
	await send(navigator.serviceWorker.controller);
	const ready = await Promise.race([
		navigator.serviceWorker.ready,
		new Promise<null>((r) => setTimeout(() => r(null), 3000)),
	]);
	if (ready?.active && ready.active !== navigator.serviceWorker.controller)
		await send(ready.active);
}
