import { partsOf } from './part-kinds';
import { type BuildDocument, PART_GROUPS, type PartGroup } from './types';

export interface MergeConflict {
	group: PartGroup;
	id: string;
	label: string;
	/** What each side did to the component since the plan's base. */
	plan: 'changed' | 'removed' | 'added';
	head: 'changed' | 'removed' | 'added';
}

export type MergeResult =
	{ ok: true; document: BuildDocument } | { ok: false; conflicts: MergeConflict[] };

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

/**
 * Three-way merge of a plan into the build, component by component (matched by id within each
 * group): the plan's changes since its base are applied to the head, and the head's own changes
 * since that base are kept. A component both sides changed differently is a conflict, and nothing
 * is merged. Order follows the head, with the plan's new components after.
 */
export function mergePlan(
	base: BuildDocument,
	plan: BuildDocument,
	head: BuildDocument,
): MergeResult {
	const conflicts: MergeConflict[] = [];
	const merged = { ...head } as BuildDocument;
	for (const group of PART_GROUPS) {
		type Part = NonNullable<BuildDocument[typeof group]>[number];
		const byId = (list: readonly Part[]) => new Map(list.map((p) => [p.id, p] as const));
		const b = byId(partsOf(base, group));
		const p = byId(partsOf(plan, group));
		const h = byId(partsOf(head, group));
		const out: Part[] = [];
		const verdict = (side: Map<string, Part>, id: string) =>
			(!b.has(id) ? 'added' : !side.has(id) ? 'removed' : 'changed') as MergeConflict['plan'];
		for (const headPart of partsOf(head, group)) {
			const id = headPart.id;
			const inBase = b.get(id);
			const inPlan = p.get(id);
			const planTouched = inBase ? !same(inBase, inPlan) : inPlan !== undefined;
			const headTouched = inBase ? !same(inBase, headPart) : true;
			if (!planTouched) {
				out.push(headPart);
			} else if (!headTouched || same(inPlan, headPart)) {
				if (inPlan) out.push(inPlan);
			} else {
				conflicts.push({
					group,
					id,
					label: headPart.label || id,
					plan: verdict(p, id),
					head: verdict(h, id),
				});
			}
		}
		for (const planPart of partsOf(plan, group)) {
			if (h.has(planPart.id)) continue;
			const inBase = b.get(planPart.id);
			if (!inBase)
				out.push(planPart); // new in the plan
			else if (!same(inBase, planPart))
				conflicts.push({
					group,
					id: planPart.id,
					label: planPart.label || planPart.id,
					plan: 'changed',
					head: 'removed',
				});
			// else: unchanged by the plan and removed in the head: stays removed.
		}
		// A group none of the three documents has stays absent (older documents keep their shape).
		if (out.length > 0 || head[group] !== undefined)
			(merged as unknown as Record<string, Part[]>)[group] = out;
	}
	return conflicts.length ? { ok: false, conflicts } : { ok: true, document: merged };
}
