/*
 * Loaded into the service worker (workbox importScripts). Everything it keeps for offline use
 * belongs to one member: the page tells it who is signed in (a message on every page load, and
 * null when signing out); when that changes, the pages and data kept for the previous member are
 * deleted. Each kept answer carries `x-sagwise-user` (the member it was made for): it is stored only
 * while that member is the one signed in, so an answer still arriving after a sign-out is dropped,
 * and served only to them.
 */
const SAGWISE_PRIVATE_CACHES = ['sagwise-pages', 'sagwise-data'];
const SAGWISE_META = 'sagwise-meta';
const SAGWISE_WHO = '/__sagwise/who';

let sagwiseWho;

/** The member the device is signed in as (null: nobody), remembered across restarts of the worker. */
self.sagwiseCurrentUser = async () => {
	if (sagwiseWho !== undefined) return sagwiseWho;
	try {
		const kept = await (await caches.open(SAGWISE_META)).match(SAGWISE_WHO);
		sagwiseWho = kept ? (await kept.json()).id : null;
	} catch {
		sagwiseWho = null;
	}
	return sagwiseWho;
};

async function sagwiseSetUser(id) {
	const before = await self.sagwiseCurrentUser();
	sagwiseWho = id;
	if (before !== id) await Promise.all(SAGWISE_PRIVATE_CACHES.map((name) => caches.delete(name)));
	const meta = await caches.open(SAGWISE_META);
	await meta.put(
		SAGWISE_WHO,
		new Response(JSON.stringify({ id }), { headers: { 'content-type': 'application/json' } }),
	);
}

self.addEventListener('message', (event) => {
	const data = event.data;
	if (!data || data.type !== 'sagwise-user') return;
	const id = typeof data.id === 'string' && data.id ? data.id : null;
	event.waitUntil(
		sagwiseSetUser(id).then(() => {
			if (event.ports && event.ports[0]) event.ports[0].postMessage('ok');
		}),
	);
});
