// @vitest-environment jsdom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { buildDrafts, forgetDraftsExcept, planDrafts } from '@/lib/client/draft-store';
import type { BuildDocument } from '@/engine';

const doc = {
	schemaVersion: 1,
	nodes: [],
	alternators: [],
	banks: [],
	amplifiers: [],
	loads: [],
	cables: [],
} as BuildDocument;

/** The member the page is for, as BaseLayout states it on the body. */
const signedIn = (id: string | null) => {
	if (id) document.body.dataset.userId = id;
	else delete document.body.dataset.userId;
};

beforeEach(() => signedIn('member-a'));
afterEach(() => {
	vi.restoreAllMocks();
	window.localStorage.clear();
});

describe('draft store', () => {
	it('keeps a draft per vehicle and per plan, apart, until it is cleared', () => {
		buildDrafts.store('v1', { baseRevisionId: 'r3', document: doc, message: 'thicker ground' });
		planDrafts.store('v1', {
			version: 2,
			name: 'Second bank',
			notes: '',
			document: doc,
			parts: [],
		});
		expect(buildDrafts.load('v1')).toMatchObject({
			baseRevisionId: 'r3',
			message: 'thicker ground',
		});
		expect(buildDrafts.load('v1')!.savedAt).toMatch(/^\d{4}-\d{2}-\d{2}T/);
		expect(planDrafts.load('v1')).toMatchObject({ version: 2, name: 'Second bank' });
		expect(buildDrafts.load('v2')).toBeNull();
		buildDrafts.clear('v1');
		expect(buildDrafts.load('v1')).toBeNull();
		expect(planDrafts.load('v1')).not.toBeNull();
	});

	it('never throws when storage is full or holds something unreadable', () => {
		vi.spyOn(Storage.prototype, 'setItem').mockImplementation(() => {
			throw new DOMException('full', 'QuotaExceededError');
		});
		expect(() =>
			buildDrafts.store('v1', { baseRevisionId: null, document: doc, message: '' }),
		).not.toThrow();
		vi.restoreAllMocks();
		window.localStorage.setItem('sagwise.draft.member-a.v9', '{not json');
		expect(buildDrafts.load('v9')).toBeNull();
	});

	it('offers a draft only to the member who made it, and keeps none signed out', () => {
		buildDrafts.store('v1', { baseRevisionId: 'r3', document: doc, message: 'by A' });
		signedIn('member-b');
		expect(buildDrafts.load('v1')).toBeNull();
		buildDrafts.store('v1', { baseRevisionId: 'r3', document: doc, message: 'by B' });
		signedIn('member-a');
		expect(buildDrafts.load('v1')!.message).toBe('by A');
		signedIn(null);
		expect(buildDrafts.load('v1')).toBeNull();
		buildDrafts.store('v2', { baseRevisionId: null, document: doc, message: 'nobody' });
		expect(Object.keys(window.localStorage).filter((k) => k.includes('v2'))).toEqual([]);
	});

	it('forgets every other member’s drafts, and all of them at sign-out', () => {
		buildDrafts.store('v1', { baseRevisionId: null, document: doc, message: 'A' });
		signedIn('member-b');
		planDrafts.store('p1', { version: 1, name: 'B plan', notes: '', document: doc, parts: [] });
		window.localStorage.setItem('sagwise.draft.v7', '{}'); // from before drafts were filed by member
		window.localStorage.setItem('sagwise.units', 'metric'); // not a draft: kept
		forgetDraftsExcept('member-b');
		expect(Object.keys(window.localStorage).sort()).toEqual([
			'sagwise.plan-draft.member-b.p1',
			'sagwise.units',
		]);
		forgetDraftsExcept(null);
		expect(Object.keys(window.localStorage)).toEqual(['sagwise.units']);
	});
});
