import type { APIRoute } from 'astro';
import { documentProblems, mergePlan } from '@/engine';
import type { RevisionDto } from '@/lib/schemas/vehicles';
import { findHeadRevision, findRevision } from '@/lib/server/db/builds';
import { installPlan } from '@/lib/server/db/plans';
import { findSeason } from '@/lib/server/db/seasons';
import { conflict, problem, readJson } from '@/lib/server/http';
import { installPlanSchema } from '@/lib/schemas/plans';
import { requirePlan } from '@/lib/server/access';
import { runEngine } from '@/lib/server/engine/pool';

/**
 * The plan's document becomes the build's next revision, with a message naming the plan. The body
 * names the head the installer saw; if someone saved since, 409 with the head (nothing written).
 * A plan started from an older revision is merged: its changes since that revision are applied to
 * the head; a part both changed is a conflict (409 naming it).
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const found = await requirePlan(locals, params, 'member');
	if (!found.ok) return found.response;
	const body = await readJson(request, installPlanSchema);
	if (!body.ok) return body.response;
	const { build, plan, access } = found.value;
	const head = await findHeadRevision(locals.db, build.id);
	if ((head?.id ?? null) !== body.data.parentId) return stale(head);
	const season = body.data.recordPurchasesIn
		? await findSeason(locals.db, access.teamId, body.data.recordPurchasesIn)
		: null;
	if (body.data.recordPurchasesIn && !season)
		return problem(400, 'invalid_input', 'No such season in this team', [
			{ path: 'recordPurchasesIn', message: 'Not a season of this team' },
		]);
	// The plan's changes since its base go on top of the head, keeping what others saved since.
	let document = plan.document;
	if (head && plan.baseRevisionId && plan.baseRevisionId !== head.id) {
		const base = await findRevision(locals.db, build.id, plan.baseRevisionId);
		const merged = base ? mergePlan(base.document, plan.document, head.document) : null;
		if (merged && !merged.ok) {
			return problem(
				409,
				'conflict',
				`The plan and revision ${head.number} both changed ${merged.conflicts.map((c) => c.label).join(', ')}. Start a new plan from revision ${head.number}, or edit this one to match.`,
				merged.conflicts.map((c) => ({
					path: `${c.group}.${c.id}`,
					message: `${c.label}: ${c.plan} in the plan, ${c.head} in revision ${head.number}`,
				})),
			);
		}
		if (merged) document = merged.document;
	}
	// The whole schema, not the topology alone: merging plans started from one old revision can
	// add their parts together past a limit (a cable count, say) that no single save could.
	const issues = documentProblems(document);
	if (issues.length)
		return problem(
			422,
			'invalid_merge',
			`Installing this plan would make a build Sagwise cannot accept: ${issues[0]!.message}${issues.length > 1 ? ` (and ${issues.length - 1} more)` : ''}. Nothing was saved; fix the plan in its editor first.`,
			issues.map((i) => ({ path: `document.${i.path}`, message: i.message })),
		);
	// A plan that brings a danger finding the head does not have is installed only once the
	// installer has seen it named (the comparison and the plan page ask, then send its key).
	const dangers = await runEngine(
		'addedDangers',
		{ before: head?.document ?? null, after: document },
		{ team: access.teamId, signal: request.signal },
	);
	const accepted = new Set(body.data.acceptDangers);
	const unseen = dangers.filter((d) => !accepted.has(d.key));
	if (unseen.length)
		return problem(
			409,
			'confirm_findings',
			`Installing “${plan.name}” brings ${unseen.length === 1 ? 'a safety finding' : `${unseen.length} safety findings`} the build does not have: ${unseen.map((d) => d.message).join(' ')} Confirm to install it anyway.`,
			undefined,
			{},
			{ findings: dangers },
		);
	const message = body.data.message || `Installed plan “${plan.name}”`;
	const result = await installPlan(locals.db, {
		buildId: build.id,
		planId: plan.id,
		parentId: body.data.parentId,
		document,
		message,
		authorId: access.userId,
		purchases: season
			? {
					seasonId: season.id,
					boughtOn: new Date().toISOString().slice(0, 10),
					paidByName: locals.user?.name || locals.user?.email || '',
					planName: plan.name,
					parts: plan.parts,
				}
			: undefined,
	});
	if (!result.ok) return stale(await findHeadRevision(locals.db, build.id));
	return Response.json(
		(await findRevision(locals.db, build.id, result.revision.id)) as RevisionDto,
		{ status: 201 },
	);
};

function stale(head: RevisionDto | undefined) {
	return conflict(
		`Revision ${head?.number ?? '?'} was saved after you looked. Compare the plan with it, then install again.`,
		{ head: head ?? null },
	);
}
