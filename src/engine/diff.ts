import { partsOf } from './part-kinds';
import { type BuildDocument, PART_GROUPS, type PartGroup } from './types';

export interface FieldChange {
	/** Dotted path inside the component, e.g. `size.awg` or `fuses.0.ratingA`. */
	field: string;
	before: unknown;
	after: unknown;
}

export interface ComponentChange {
	group: PartGroup;
	id: string;
	label: string;
	kind: 'added' | 'removed' | 'changed';
	fields: FieldChange[];
}

type Scalar = string | number | boolean | null;

function flatten(
	value: unknown,
	prefix = '',
	out: Record<string, Scalar> = {},
): Record<string, Scalar> {
	if (value !== null && typeof value === 'object') {
		const entries = Array.isArray(value)
			? value.map((v, i) => [String(i), v] as const)
			: Object.entries(value);
		if (entries.length === 0) out[prefix] = Array.isArray(value) ? '[]' : '{}';
		for (const [k, v] of entries) flatten(v, prefix ? `${prefix}.${k}` : k, out);
	} else {
		out[prefix] = (value ?? null) as Scalar;
	}
	return out;
}

/**
 * What changed between two build documents, component by component (matched by id within each
 * group): added and removed components with all their fields, changed ones with each field that
 * differs. Field values are in the document's SI units; the interface converts for display.
 */
export function diffBuilds(before: BuildDocument, after: BuildDocument): ComponentChange[] {
	const changes: ComponentChange[] = [];
	for (const group of PART_GROUPS) {
		const a = new Map<string, { id: string; label: string }>(
			partsOf(before, group).map((x) => [x.id, x]),
		);
		const b = new Map<string, { id: string; label: string }>(
			partsOf(after, group).map((x) => [x.id, x]),
		);
		for (const [id, item] of a) {
			if (!b.has(id)) {
				const fields = Object.entries(flatten(item))
					.filter(([f]) => f !== 'id')
					.map(([field, v]) => ({ field, before: v, after: undefined }));
				changes.push({ group, id, label: item.label, kind: 'removed', fields });
			}
		}
		for (const [id, item] of b) {
			const old = a.get(id);
			if (!old) {
				const fields = Object.entries(flatten(item))
					.filter(([f]) => f !== 'id')
					.map(([field, v]) => ({ field, before: undefined, after: v }));
				changes.push({ group, id, label: item.label, kind: 'added', fields });
				continue;
			}
			const fa = flatten(old);
			const fb = flatten(item);
			const keys = [...new Set([...Object.keys(fa), ...Object.keys(fb)])].sort();
			// An empty list turning into items (or back) shows as its items, not as "[] → —".
			const emptyMarker = (k: string) =>
				(fa[k] === '[]' && fb[k] === undefined) || (fb[k] === '[]' && fa[k] === undefined);
			const fields = keys
				.filter((k) => fa[k] !== fb[k] && !emptyMarker(k))
				.map((k) => ({ field: k, before: fa[k], after: fb[k] }));
			if (fields.length) changes.push({ group, id, label: item.label, kind: 'changed', fields });
		}
	}
	return changes;
}
