// The engine's one error type lives apart from the guard so that the solver can throw it without
// bringing the build document's schema (and zod) into the pages that compute in the browser.

/** One thing wrong with what an engine function was given: the field's path and what is wrong. */
export interface EngineProblem {
	/** e.g. `cables.2.lengthM`, `nodes`, `scenario.burpStepS`. */
	path: string;
	message: string;
}

/**
 * What the engine's public functions throw when given a document or options they cannot compute
 * with (a document that skipped the schema, a step of zero): never a bare Error, never NaN out.
 * `problems` names each field.
 */
export class EngineInputError extends Error {
	readonly code = 'invalid_engine_input' as const;
	constructor(readonly problems: EngineProblem[]) {
		super(
			`The engine cannot compute with this input: ${problems
				.slice(0, 3)
				.map((p) => `${p.path || '(document)'}: ${p.message}`)
				.join('; ')}${problems.length > 3 ? ` and ${problems.length - 3} more` : ''}`,
		);
		this.name = 'EngineInputError';
	}
}
