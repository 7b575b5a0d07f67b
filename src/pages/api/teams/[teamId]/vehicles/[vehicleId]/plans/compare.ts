import type { APIRoute } from 'astro';
import { compareQuerySchema, type PlanDto } from '@/lib/schemas/plans';
import { requireVehicle } from '@/lib/server/access';
import { findRevision } from '@/lib/server/db/builds';
import { findPlan, findPlanVersions, partsTotalMinor } from '@/lib/server/db/plans';
import { findTeamSettingsRow } from '@/lib/server/db/teams';
import { ComputeRefused, cachedEngineJson, keyPart } from '@/lib/server/engine/cache';
import { runEngine } from '@/lib/server/engine/pool';
import { problem, readQuery } from '@/lib/server/http';
import { canonicalScenario } from '@/lib/scenario-steps';

/**
 * The build's current revision and up to three plans side by side (?plans=a,b,c), computed on the
 * server. Cached by what it depends on: the head revision, each plan's id and version, the
 * currency and the scenario. The key comes from light lookups; the documents are read only when
 * the answer has to be computed.
 */
export const GET: APIRoute = async ({ params, url, locals, request }) => {
	const found = await requireVehicle(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const query = readQuery(url, compareQuerySchema);
	if (!query.ok) return query.response;
	const { build, vehicle, access } = found.value;
	const headId = build.head_revision_id;
	if (!headId) return problem(409, 'conflict', 'The build has no revision to compare with yet');
	const planIds = [...new Set(query.data.plans)];
	const [versions, { currency }] = await Promise.all([
		findPlanVersions(locals.db, vehicle.id, planIds),
		findTeamSettingsRow(locals.db, access.teamId),
	]);
	const missing = planIds.find((id) => !versions.has(id));
	if (missing)
		return problem(404, 'not_found', 'No such plan', [
			{ path: 'plans', message: `${missing} is not a plan of this vehicle` },
		]);
	const scenario = canonicalScenario({
		engineRpm: query.data.engineRpm,
		conductorTempC: query.data.conductorTempC,
	});
	const key = `compare|${headId}|${planIds.map((id) => `${id}:${versions.get(id)}`).join(',')}|${currency}|${keyPart(scenario)}`;
	return cachedEngineJson(request, key, async (signal) => {
		const [head, plans] = await Promise.all([
			findRevision(locals.db, build.id, headId),
			Promise.all(planIds.map((id) => findPlan(locals.db, vehicle.id, id))),
		]);
		// A plan changed or deleted between the two reads: the answer would not be the one the key
		// names, so it is refused rather than cached under that key.
		const current = plans.filter(
			(p): p is PlanDto => p !== undefined && p.version === versions.get(p.id),
		);
		if (!head || current.length !== planIds.length)
			throw new ComputeRefused(() =>
				problem(409, 'conflict', 'A plan changed while it was being compared; try again'),
			);
		return runEngine(
			'compare',
			{
				currency,
				head: { id: head.id, number: head.number, message: head.message, document: head.document },
				plans: current.map((p) => ({
					id: p.id,
					name: p.name,
					document: p.document,
					cost: partsTotalMinor(p.parts) / 100,
				})),
				scenario,
			},
			{ team: access.teamId, signal },
		);
	});
};
