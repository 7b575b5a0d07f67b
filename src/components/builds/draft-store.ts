import type { BuildDocument } from '@/engine';

export interface StoredDraft {
	baseRevisionId: string | null;
	document: BuildDocument;
	message: string;
	savedAt: string;
}

const key = (vehicleId: string) => `sagwise.draft.${vehicleId}`;

/** The draft lives in the browser until it is saved, so a reload or a crash loses nothing. */
export function loadDraft(vehicleId: string): StoredDraft | null {
	try {
		const raw = window.localStorage.getItem(key(vehicleId));
		return raw ? (JSON.parse(raw) as StoredDraft) : null;
	} catch {
		return null;
	}
}

export function storeDraft(vehicleId: string, draft: Omit<StoredDraft, 'savedAt'>): void {
	try {
		window.localStorage.setItem(key(vehicleId), JSON.stringify({ ...draft, savedAt: new Date().toISOString() }));
	} catch {
		// storage full or disabled: the draft still lives in memory
	}
}

export function clearDraft(vehicleId: string): void {
	try {
		window.localStorage.removeItem(key(vehicleId));
	} catch {
		// ignore
	}
}
