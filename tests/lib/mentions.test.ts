import { describe, expect, it } from 'vitest';
import {
	findMentions,
	mentionQueryAt,
	mentionSegments,
	suggestMembers,
} from '../../src/lib/mentions';

/** Who an @mention in a comment names, against the team's members. */
describe('mentions', () => {
	const members = [
		{ id: 'u1', name: 'Sam Reyes' },
		{ id: 'u2', name: 'Sam' },
		{ id: 'u3', name: 'Jo-Ann Lutz' },
		{ id: 'u4', name: 'Ola' },
	];
	const ids = (body: string) => findMentions(body, members).mentioned.map((m) => m.id);

	it('reads a name with a space, taking the longest member name that fits', () => {
		expect(ids('@Sam Reyes why 1/0 here?')).toEqual(['u1']);
		expect(ids('@Sam why 1/0 here?')).toEqual(['u2']);
		expect(ids('ask @Jo-Ann Lutz, then @sam reyes.')).toEqual(['u3', 'u1']);
	});

	it('needs the name to end where a word ends', () => {
		// "@Olaf" is not Ola; it is an unknown name.
		expect(findMentions('@Olaf said so', members)).toEqual({ mentioned: [], unknown: ['Olaf'] });
		expect(ids('@Ola: the rear bank is warm')).toEqual(['u4']);
	});

	it('names each member once, however often mentioned', () => {
		expect(ids('@Ola @Ola @ola')).toEqual(['u4']);
	});

	it('is not fooled by an address or an @ inside a word', () => {
		expect(findMentions('mail sam@example.test or ola@x', members)).toEqual({
			mentioned: [],
			unknown: [],
		});
	});

	it('reports names that are no member of the team, and notifies nobody for them', () => {
		// A person of another team called Kim is not in this list: a mention of them is unknown here.
		const r = findMentions('@Kim Park and @Ola, also @nobody.', members);
		expect(r.mentioned.map((m) => m.id)).toEqual(['u4']);
		expect(r.unknown).toEqual(['Kim', 'nobody']);
	});

	it('keeps every character of the text in its pieces, in order', () => {
		const body = 'Line one\n@Sam Reyes <b>bold?</b> https://x.test/a?b=1 @Ola!';
		const parts = mentionSegments(body, members);
		expect(parts.map((p) => p.text).join('')).toBe(body);
		expect(parts.filter((p) => 'member' in p).map((p) => p.text)).toEqual(['@Sam Reyes', '@Ola']);
	});

	it('offers the members whose name starts with what is typed after an @ at the caret', () => {
		const text = 'Ask @sam r';
		const at = mentionQueryAt(text, text.length)!;
		expect(at).toEqual({ start: 4, query: 'sam r' });
		expect(suggestMembers(at.query, members).map((m) => m.id)).toEqual(['u1']);
		expect(suggestMembers('', members)).toHaveLength(4);
		// Typed in full: nothing left to offer.
		expect(suggestMembers('Ola', members)).toEqual([]);
		// Not in a mention: an address, or the caret elsewhere.
		expect(mentionQueryAt('mail sam@exa', 12)).toBeNull();
		expect(mentionQueryAt('@Sam then\nmore', 14)).toBeNull();
	});
});
