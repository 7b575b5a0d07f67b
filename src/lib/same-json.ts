/**
 * JSON with every object's keys in sorted order. PostgreSQL's jsonb hands documents back with
 * their keys reordered, so two equal documents can stringify differently; compare through this.
 */
export function canonicalJson(value: unknown): string {
	return JSON.stringify(value, (_key, v: unknown) =>
		v && typeof v === 'object' && !Array.isArray(v)
			? Object.fromEntries(
					Object.entries(v as Record<string, unknown>).sort(([a], [b]) =>
						a < b ? -1 : a > b ? 1 : 0,
					),
				)
			: v,
	);
}

/** Whether two JSON values are equal whatever the order of their keys. */
export function sameJson(a: unknown, b: unknown): boolean {
	return canonicalJson(a) === canonicalJson(b);
}
