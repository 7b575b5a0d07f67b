// @vitest-environment jsdom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { buildDrafts, planDrafts } from '@/lib/client/draft-store';
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
		window.localStorage.setItem('sagwise.draft.v9', '{not json');
		expect(buildDrafts.load('v9')).toBeNull();
	});
});
