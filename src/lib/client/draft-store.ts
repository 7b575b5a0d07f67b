import type { BuildDocument } from '@/engine/browser';
import { pageUserId } from '@/lib/client/current-user';

/**
 * Unsaved work lives in the browser until it is saved, so a reload, a crash or a lost connection
 * loses nothing. One store per kind of draft, keyed by the signed-in member and the thing being
 * edited (a vehicle or plan, which belongs to one team): on a shared phone nobody is offered
 * someone else's edits, and signed out nothing is kept (`forgetDraftsExcept`). Storage that is full
 * or disabled leaves the draft in memory only (never an error).
 */
export interface DraftStore<T> {
	load(id: string): (T & { savedAt: string }) | null;
	store(id: string, draft: T): void;
	clear(id: string): void;
}

/** What this device keeps per member in localStorage: drafts, and the vehicle last logged for. */
const MEMBER_PREFIXES = ['draft', 'plan-draft', 'last-vehicle', 'comment-draft'] as const;

export function draftStore<T>(prefix: (typeof MEMBER_PREFIXES)[number]): DraftStore<T> {
	const key = (id: string) => {
		const user = pageUserId();
		return user ? `sagwise.${prefix}.${user}.${id}` : null;
	};
	return {
		load(id) {
			const k = key(id);
			if (!k) return null;
			try {
				const raw = window.localStorage.getItem(k);
				return raw ? (JSON.parse(raw) as T & { savedAt: string }) : null;
			} catch {
				return null;
			}
		},
		store(id, draft) {
			const k = key(id);
			if (!k) return;
			try {
				window.localStorage.setItem(
					k,
					JSON.stringify({ ...draft, savedAt: new Date().toISOString() }),
				);
			} catch {
				// storage full or disabled: the draft still lives in memory
			}
		},
		clear(id) {
			const k = key(id);
			if (!k) return;
			try {
				window.localStorage.removeItem(k);
			} catch {
				// storage disabled: nothing to clear
			}
		},
	};
}

/**
 * Removes every draft (and every other per-member note) on this device that is not the given
 * member's (all of them when null: on sign-out, and before another member's first page). Drafts
 * from before they were filed by member belong to nobody known and go too.
 */
export function forgetDraftsExcept(userId: string | null): void {
	try {
		const store = window.localStorage;
		const doomed: string[] = [];
		for (let i = 0; i < store.length; i++) {
			const k = store.key(i);
			if (!k) continue;
			const prefix = MEMBER_PREFIXES.find((p) => k.startsWith(`sagwise.${p}.`));
			if (!prefix) continue;
			if (userId === null || !k.startsWith(`sagwise.${prefix}.${userId}.`)) doomed.push(k);
		}
		for (const k of doomed) store.removeItem(k);
	} catch {
		// storage disabled: nothing kept, nothing to forget
	}
}

/** A build's draft: the revision it started from, the edited document and the message typed so far. */
export interface BuildDraft {
	baseRevisionId: string | null;
	document: BuildDocument;
	message: string;
}

/** A plan's draft: the version it started from, and everything the plan editor edits. */
export interface PlanDraft {
	version: number;
	name: string;
	notes: string;
	document: BuildDocument;
	parts: Array<{ item: string; quantity: string; unitPrice: string; link: string }>;
}

export const buildDrafts = draftStore<BuildDraft>('draft');
export const planDrafts = draftStore<PlanDraft>('plan-draft');
/** A comment being written, per thread (`on:id`). */
export const commentDrafts = draftStore<{ body: string }>('comment-draft');

/** The vehicle a member last logged a run for, per team (the day page puts it first). */
export const lastVehicles = draftStore<{ vehicleId: string }>('last-vehicle');
