import { useState } from 'react';

/**
 * What a field of a server-rendered form already holds when its island wakes (client:interact):
 * someone typed there before the script arrived. Null on the server, or when the field is empty.
 */
export function typedValue(form: string, name: string): string | null {
	if (typeof document === 'undefined') return null;
	const el = document.querySelector<HTMLInputElement>(
		`form[aria-label="${CSS.escape(form)}"] [name="${CSS.escape(name)}"]`,
	);
	return el && el.type !== 'file' && el.value !== '' ? el.value : null;
}

/**
 * State for a form field that starts from what was typed before hydration, so no keystroke made
 * while the script loaded is lost (React would otherwise reset the field to its first state).
 */
export function useTypedState(form: string, name: string, initial: string) {
	return useState(() => typedValue(form, name) ?? initial);
}
