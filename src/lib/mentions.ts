/**
 * `@name` mentions in a comment, read against the team's members. A name may hold spaces
 * ("@Ana Ruiz"): at each `@` that starts a word, the longest member name that follows (in any
 * case) and ends at a word's end is the mention. An `@` inside a word (an e-mail address) is
 * not a mention. Anything else after an `@` is an unknown name, reported to the writer and
 * notifying nobody: only members of the team can be mentioned, whoever else bears the name.
 */

export interface Mentionable {
	id: string;
	name: string;
}

export type MentionSegment = { text: string } | { text: string; member: Mentionable };

const WORD = /[\p{L}\p{N}_]/u;

function mentionAt(body: string, at: number, byLength: Mentionable[]): Mentionable | null {
	if (body[at] !== '@' || (at > 0 && WORD.test(body[at - 1]!))) return null;
	const rest = body.slice(at + 1).toLocaleLowerCase();
	for (const m of byLength) {
		const name = m.name.toLocaleLowerCase();
		if (name.length === 0 || !rest.startsWith(name)) continue;
		const next = rest[name.length];
		if (next === undefined || !WORD.test(next)) return m;
	}
	return null;
}

const longestFirst = (members: readonly Mentionable[]) =>
	members
		.filter((m) => m.name.trim().length > 0)
		.map((m) => ({ id: m.id, name: m.name.trim() }))
		.sort((a, b) => b.name.length - a.name.length);

/** The comment cut into plain text and mentions of members, in order (for showing it). */
export function mentionSegments(body: string, members: readonly Mentionable[]): MentionSegment[] {
	const byLength = longestFirst(members);
	const out: MentionSegment[] = [];
	let plain = '';
	for (let i = 0; i < body.length; i++) {
		const m = mentionAt(body, i, byLength);
		if (!m) {
			plain += body[i];
			continue;
		}
		if (plain) out.push({ text: plain });
		plain = '';
		const text = body.slice(i, i + 1 + m.name.length);
		out.push({ text, member: m });
		i += text.length - 1;
	}
	if (plain) out.push({ text: plain });
	return out;
}

/** Who a comment mentions (each once, in order) and the names after an `@` that are no member. */
export function findMentions(
	body: string,
	members: readonly Mentionable[],
): { mentioned: Mentionable[]; unknown: string[] } {
	const mentioned = new Map<string, Mentionable>();
	const unknown = new Set<string>();
	for (const s of mentionSegments(body, members)) {
		if ('member' in s) {
			mentioned.set(s.member.id, s.member);
			continue;
		}
		for (const match of s.text.matchAll(/(^|[^\p{L}\p{N}_])@([\p{L}\p{N}_][\p{L}\p{N}_.'-]*)/gu))
			unknown.add(match[2]!.replace(/[.'-]+$/, ''));
	}
	return { mentioned: [...mentioned.values()], unknown: [...unknown] };
}

/**
 * The name being typed after an `@` that ends at the caret ("@Sam Re|"), with where its `@` is;
 * null when the caret is not in one (an `@` inside a word, or more than a name's length back).
 */
export function mentionQueryAt(
	text: string,
	caret: number,
): { start: number; query: string } | null {
	const before = text.slice(0, caret);
	const m = /(?:^|[^\p{L}\p{N}_])@([^@\n]{0,40})$/u.exec(before);
	if (!m) return null;
	return { start: caret - m[1]!.length - 1, query: m[1]! };
}

/** Members whose name starts with what is typed (any case), a name typed in full excepted. */
export function suggestMembers(
	query: string,
	members: readonly Mentionable[],
	max = 5,
): Mentionable[] {
	const q = query.toLocaleLowerCase();
	return members
		.filter((m) => {
			const name = m.name.toLocaleLowerCase();
			return name.startsWith(q) && name !== q.trimEnd();
		})
		.slice(0, max);
}
