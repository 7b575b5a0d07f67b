import { describe, expect, it } from 'vitest';
import { sameJson } from '../../src/lib/same-json';

describe('sameJson', () => {
	// PostgreSQL's jsonb stores object keys shorter-first, then by bytes, so a document read back
	// from the database has another key order than the one the editor sent.
	it('treats documents that differ only in key order as the same', () => {
		const sent = {
			name: 'Plan',
			document: { cables: [{ lengthM: 2, id: 'c1', size: { kind: 'awg', awg: '4' } }] },
		};
		const back = {
			document: { cables: [{ id: 'c1', size: { awg: '4', kind: 'awg' }, lengthM: 2 }] },
			name: 'Plan',
		};
		expect(JSON.stringify(sent) === JSON.stringify(back)).toBe(false);
		expect(sameJson(sent, back)).toBe(true);
	});

	it('still sees a changed value, and array order', () => {
		expect(sameJson({ a: [1, 2] }, { a: [2, 1] })).toBe(false);
		expect(sameJson({ a: { b: 1 } }, { a: { b: 2 } })).toBe(false);
	});
});
