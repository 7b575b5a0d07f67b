import { z } from 'zod';

/**
 * Text a person types is text: no NUL, no other control characters, and in a one-line name no
 * line break of any kind (a name ends up in headings, CSV cells, mail subjects and SPICE comments,
 * where a line break starts something new). Notes may keep tabs and line breaks.
 */
// eslint-disable-next-line no-control-regex -- matching control characters is the point
const CONTROL_IN_LINE = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/;
// eslint-disable-next-line no-control-regex -- matching control characters is the point
const CONTROL_IN_NOTES = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/;

export const LINE_MESSAGE = 'Use plain text on one line: no line breaks or control characters';
export const NOTES_MESSAGE = 'Use plain text: no control characters';

export const hasLineControl = (s: string) => CONTROL_IN_LINE.test(s);
export const hasNotesControl = (s: string) => CONTROL_IN_NOTES.test(s);

/** A one-line name or label, trimmed; `required` is the message for an empty one. */
export function lineText(max: number, opts: { required?: string; maxMessage?: string } = {}) {
	let s = z.string({ error: 'Must be text' }).trim();
	if (opts.required) s = s.min(1, opts.required);
	return s
		.max(max, opts.maxMessage ?? `Keep it under ${max} characters`)
		.refine((v) => !hasLineControl(v), LINE_MESSAGE);
}

/** Free text over several lines (notes, messages), trimmed. */
export function notesText(max: number, opts: { required?: string; maxMessage?: string } = {}) {
	let s = z.string({ error: 'Must be text' }).trim();
	if (opts.required) s = s.min(1, opts.required);
	return s
		.max(max, opts.maxMessage ?? `Keep it under ${max} characters`)
		.refine((v) => !hasNotesControl(v), NOTES_MESSAGE);
}

/**
 * The first string anywhere in a value (object keys too) that holds a character no text field
 * takes (NUL and the other C0 controls but tab and line breaks), with its dotted path. A last
 * line of defence behind the field schemas: PostgreSQL refuses NUL in text and JSONB, and nothing
 * of ours means a control character.
 */
export function findControlCharacter(value: unknown, path: string[] = []): string | null {
	if (typeof value === 'string')
		return CONTROL_IN_NOTES.test(value) ? path.join('.') || '(body)' : null;
	if (Array.isArray(value)) {
		for (let i = 0; i < value.length; i++) {
			const found = findControlCharacter(value[i], [...path, String(i)]);
			if (found !== null) return found;
		}
		return null;
	}
	if (value && typeof value === 'object') {
		for (const [k, v] of Object.entries(value)) {
			if (CONTROL_IN_NOTES.test(k)) return [...path, k.replace(CONTROL_IN_NOTES, '?')].join('.');
			const found = findControlCharacter(v, [...path, k]);
			if (found !== null) return found;
		}
	}
	return null;
}
