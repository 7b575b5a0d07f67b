import { createStore, del, entries, set } from 'idb-keyval';
import { useEffect, useRef, useSyncExternalStore } from 'react';
import { api, ApiError } from '@/lib/client/api-client';
import type { NewRun } from '@/lib/client/queries/runs';
import { liveUserId, pageUserId, pageUserName } from '@/lib/client/current-user';

/**
 * Writes made with no connection wait here, on the device (IndexedDB), until the server has them.
 * Each run carries the client key it was made with, so sending it again — after a lost answer, a
 * second tab, a reload — answers the run it made instead of logging a second one; a sign-off
 * carries what the member saw, so a checklist that changed meanwhile is refused and shown (409),
 * never overwritten. Nothing here is sent by the service worker: the page sends it when it is
 * open and online.
 */

export type LoggerMapping = {
	timeColumn: string;
	voltsColumn: string;
	ampsColumn: string;
	timeUnit: string;
};

interface EntryBase {
	/** The client key of the write (a UUID made once, when the member pressed the button). */
	id: string;
	teamId: string;
	vehicleId: string;
	/** Who made it: only their session sends it (another member signed in on the phone does not). */
	userId: string;
	/** Their name, to say whose entries wait when someone else is signed in on the device. */
	userName?: string | null;
	/** When the member made it, on this device. */
	createdAt: string;
	/**
	 * waiting: goes out with the next connection; duplicate / conflict: the server asked the member
	 * to decide; failed: refused, with the reason in `problem`.
	 */
	state: 'waiting' | 'duplicate' | 'conflict' | 'failed';
	problem?: string;
}

export interface RunEntry extends EntryBase {
	kind: 'run';
	body: NewRun & { clientKey: string };
	file?: { blob: Blob; name: string; mapping: LoggerMapping };
	/** Set once the server has the run (its logger file may still be waiting). */
	runId?: string;
}

export interface SignoffEntry extends EntryBase {
	kind: 'signoff';
	eventId: string;
	/** The item's label as the member saw it, for the list of waiting entries. */
	label: string;
	body: {
		vehicleId: string;
		itemKey: string;
		signed: boolean;
		note: string;
		seen: { revisionId: string | null; status: 'pass' | 'fail' | 'open' };
	};
}

export type OutboxEntry = RunEntry | SignoffEntry;

const store = () => createStore('sagwise-outbox', 'entries');
let snapshot: OutboxEntry[] = [];
const listeners = new Set<() => void>();
const sentListeners = new Set<(e: OutboxEntry, result: unknown) => void>();
const sessionListeners = new Set<(liveUserId: string) => void>();

/** Called when this page's member is no longer the one signed in (the page is someone else's now). */
export function onSessionChanged(listener: (liveUserId: string) => void): () => void {
	sessionListeners.add(listener);
	return () => sessionListeners.delete(listener);
}

/** Other tabs of the app hear of every change, so each shows what the device holds now. */
const channel =
	typeof BroadcastChannel === 'undefined' ? null : new BroadcastChannel('sagwise-outbox');
channel?.addEventListener('message', () => void reload());

async function reload() {
	if (typeof indexedDB === 'undefined') return;
	const all = (await entries<string, OutboxEntry>(store())).map(([, v]) => v);
	snapshot = all.sort((a, b) => a.createdAt.localeCompare(b.createdAt));
	for (const l of listeners) l();
}

async function put(entry: OutboxEntry) {
	await set(entry.id, entry, store());
	channel?.postMessage('changed');
	await reload();
}

/** Keeps a write on the device until it can be sent; tries at once when online. */
export async function enqueue(entry: OutboxEntry): Promise<void> {
	await put({ ...entry, userName: entry.userName ?? pageUserName() });
	void sendOutbox();
}

export async function discard(id: string): Promise<void> {
	await del(id, store());
	channel?.postMessage('changed');
	await reload();
}

/** The member decided: log the run even though one like it exists, or sign again on today's sheet. */
export async function retry(id: string, change?: (e: OutboxEntry) => OutboxEntry): Promise<void> {
	const e = snapshot.find((x) => x.id === id);
	if (!e) return;
	await put({ ...(change ? change(e) : e), state: 'waiting', problem: undefined });
	void sendOutbox();
}

/** Whether an answer means "try again later" rather than "no". */
const later = (e: unknown) =>
	e instanceof ApiError && (e.status === 0 || e.status === 401 || e.status >= 500);

async function sendRun(e: RunEntry): Promise<void> {
	let runId = e.runId;
	if (!runId) {
		const run = await api<{ id: string }>(`/api/teams/${e.teamId}/runs`, { json: e.body });
		runId = run.id;
		for (const l of sentListeners) l(e, run);
		if (e.file) await put({ ...e, runId });
	}
	if (e.file) {
		const form = new FormData();
		form.set('file', new File([e.file.blob], e.file.name, { type: 'text/csv' }));
		for (const [k, v] of Object.entries(e.file.mapping)) form.set(k, v);
		try {
			await api(`/api/teams/${e.teamId}/runs/${runId}/logger`, { form });
		} catch (err) {
			if (later(err)) throw err;
			await put({
				...e,
				runId,
				state: 'failed',
				problem: `The run arrived, but its logger file was refused: ${(err as Error).message}`,
			});
			return;
		}
	}
	await discard(e.id);
}

async function sendSignoff(e: SignoffEntry): Promise<void> {
	const list = await api<unknown>(`/api/teams/${e.teamId}/events/${e.eventId}/checks`, {
		json: e.body,
	});
	for (const l of sentListeners) l(e, list);
	await discard(e.id);
}

let running: Promise<void> | null = null;

/**
 * Sends what waits, oldest first, once at a time (and one tab at a time where the browser has Web
 * Locks). Stops at the first "try later" (offline, signed out, server down) and keeps the rest.
 */
export function sendOutbox(): Promise<void> {
	if (running) return running;
	const work = async () => {
		await reload();
		if (!snapshot.some((x) => x.state === 'waiting')) return;
		// Whose session the request would carry is asked of the server at send time, not read from
		// the page: a tab left open after a sign-out (or another member's sign-in in another tab)
		// still says its old member. Only the live session's author's entries go; the rest wait.
		const live = await liveUserId();
		if (!live) return;
		if (live !== pageUserId()) {
			for (const l of sessionListeners) l(live);
			return;
		}
		for (const e of snapshot.filter((x) => x.state === 'waiting' && x.userId === live)) {
			try {
				if (e.kind === 'run') await sendRun(e);
				else await sendSignoff(e);
			} catch (err) {
				if (later(err)) {
					if (err instanceof ApiError && err.status === 401)
						await put({ ...e, problem: 'Sign in again to send it.' });
					return;
				}
				const api = err instanceof ApiError ? err : null;
				await put({
					...e,
					state:
						api?.code === 'possible_duplicate'
							? 'duplicate'
							: api?.code === 'conflict'
								? 'conflict'
								: 'failed',
					problem: api?.message ?? (err as Error).message,
				});
			}
		}
	};
	const p: Promise<void> = (async () => {
		if (typeof navigator !== 'undefined' && navigator.locks)
			await navigator.locks.request('sagwise-outbox', work);
		else await work();
	})().finally(() => {
		running = null;
	});
	running = p;
	return p;
}

/**
 * Called with each entry the server accepted and what it answered (the run, the checklist), in
 * the tab that sent it; other tabs see the entry leave the outbox (useOnLeave).
 */
export function onSent(listener: (e: OutboxEntry, result: unknown) => void): () => void {
	sentListeners.add(listener);
	return () => sentListeners.delete(listener);
}

function subscribe(l: () => void) {
	listeners.add(l);
	return () => listeners.delete(l);
}

const EMPTY: OutboxEntry[] = [];

/** The signed-in member's id, as the page states it (BaseLayout's body element). */
export const currentUserId = pageUserId;

/** Every entry on the device, as a React store. */
function useAllEntries(): OutboxEntry[] {
	return useSyncExternalStore(
		subscribe,
		() => snapshot,
		() => EMPTY,
	);
}

/** The signed-in member's entries waiting on this device (filter by vehicle or event where shown). */
export function useOutbox(): OutboxEntry[] {
	const all = useAllEntries();
	const me = currentUserId();
	return me ? all.filter((e) => e.userId === me) : EMPTY;
}

/**
 * Entries on this device made by other members (another member used this phone): never shown in
 * full here, never sent with this member's session; the page says whose they are.
 */
export function useOthersOutbox(): OutboxEntry[] {
	const me = currentUserId();
	return useAllEntries().filter((e) => e.userId !== me);
}

let started = false;

/** Starts sending: now, whenever the connection comes back, and every 20 s while entries wait. */
export function startOutbox(): void {
	if (started || typeof window === 'undefined') return;
	started = true;
	window.addEventListener('online', () => void sendOutbox());
	setInterval(() => {
		if (navigator.onLine && snapshot.some((e) => e.state === 'waiting')) void sendOutbox();
	}, 20_000);
	void reload().then(() => sendOutbox());
}

/** Whether a failed write should wait on the device: no connection, or no server to answer. */
export function isOffline(error: unknown): boolean {
	return (
		(typeof navigator !== 'undefined' && !navigator.onLine) ||
		(error instanceof ApiError &&
			(error.status === 0 || error.status === 502 || error.status === 504))
	);
}

/**
 * Calls `onGone` when entries this view showed leave the outbox (sent from this tab or another),
 * so the view fetches what the server now holds.
 */
export function useOnLeave(ids: string[], onGone: () => void): void {
	const joined = ids.join(',');
	const previous = useRef<string[]>(ids);
	const latest = useRef(onGone);
	latest.current = onGone;
	useEffect(() => {
		const now = new Set(joined ? joined.split(',') : []);
		if (previous.current.some((id) => !now.has(id))) latest.current();
		previous.current = [...now];
	}, [joined]);
}
