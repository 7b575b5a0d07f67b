import { checkTopology, buildDocumentSchema, type BuildDocument } from '@/engine';

export { parseBuildDocument } from '@/engine';

/** Field errors of a draft by dotted path: the schema first, then the network's topology. */
export function validateDraft(doc: BuildDocument): Record<string, string> {
	const parsed = buildDocumentSchema.safeParse(doc);
	const errors: Record<string, string> = {};
	if (!parsed.success) {
		for (const i of parsed.error.issues) errors[i.path.map(String).join('.')] ??= i.message;
		return errors;
	}
	for (const i of checkTopology(parsed.data)) errors[i.path] ??= i.message;
	return errors;
}
