import type { z } from '@/lib/zod';

/** zod issues as { field: message }, first message per field. */
export function fieldErrors(error: z.ZodError): Record<string, string> {
	const out: Record<string, string> = {};
	for (const issue of error.issues) {
		const key = issue.path.map(String).join('.');
		out[key] ??= issue.message;
	}
	return out;
}
