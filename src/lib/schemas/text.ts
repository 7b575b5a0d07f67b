import { z } from '@/lib/zod';

import {
	CONTROL_IN_NOTES,
	hasLineControl,
	hasNotesControl,
	LINE_MESSAGE,
	NOTES_MESSAGE,
} from '@/engine/browser';

export { hasLineControl, hasNotesControl, LINE_MESSAGE, NOTES_MESSAGE };

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
	// Numbers packed in a typed array hold no text.
	if (ArrayBuffer.isView(value)) return null;
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
