import type { BuildDocument } from '@/engine';

/**
 * Unsaved work lives in the browser until it is saved, so a reload, a crash or a lost connection
 * loses nothing. One store per kind of draft, keyed by the thing being edited; storage that is
 * full or disabled leaves the draft in memory only (never an error).
 */
export interface DraftStore<T> {
	load(id: string): (T & { savedAt: string }) | null;
	store(id: string, draft: T): void;
	clear(id: string): void;
}

export function draftStore<T>(prefix: string): DraftStore<T> {
	const key = (id: string) => `sagwise.${prefix}.${id}`;
	return {
		load(id) {
			try {
				const raw = window.localStorage.getItem(key(id));
				return raw ? (JSON.parse(raw) as T & { savedAt: string }) : null;
			} catch {
				return null;
			}
		},
		store(id, draft) {
			try {
				window.localStorage.setItem(
					key(id),
					JSON.stringify({ ...draft, savedAt: new Date().toISOString() }),
				);
			} catch {
				// storage full or disabled: the draft still lives in memory
			}
		},
		clear(id) {
			try {
				window.localStorage.removeItem(key(id));
			} catch {
				// storage disabled: nothing to clear
			}
		},
	};
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
