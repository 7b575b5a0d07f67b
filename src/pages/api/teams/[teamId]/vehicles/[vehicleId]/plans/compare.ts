import type { APIRoute } from 'astro';
import { compareQuerySchema, type PlanDto } from '@/lib/schemas/plans';
import { requireVehicle } from '@/lib/server/access';
import { findHeadRevision } from '@/lib/server/db/builds';
import { findPlan, partsTotalMinor } from '@/lib/server/db/plans';
import { findTeamSettingsRow } from '@/lib/server/db/teams';
import { cachedEngineJson, keyPart } from '@/lib/server/engine/cache';
import { runEngine } from '@/lib/server/engine/pool';
import { problem, readQuery } from '@/lib/server/http';

/**
 * The build's current revision and up to three plans side by side (?plans=a,b,c), computed on the
 * server. Cached by what it depends on: the head revision, each plan's id and version, the
 * currency and the scenario.
 */
export const GET: APIRoute = async ({ params, url, locals, request }) => {
	const found = await requireVehicle(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const query = readQuery(url, compareQuerySchema);
	if (!query.ok) return query.response;
	const { build, vehicle, access } = found.value;
	const head = await findHeadRevision(locals.db, build.id);
	if (!head) return problem(409, 'conflict', 'The build has no revision to compare with yet');
	const plans: PlanDto[] = [];
	for (const id of new Set(query.data.plans)) {
		const plan = await findPlan(locals.db, vehicle.id, id);
		if (!plan)
			return problem(404, 'not_found', 'No such plan', [
				{ path: 'plans', message: `${id} is not a plan of this vehicle` },
			]);
		plans.push(plan);
	}
	const { currency } = await findTeamSettingsRow(locals.db, access.teamId);
	const scenario = {
		...(query.data.engineRpm !== undefined && { engineRpm: query.data.engineRpm }),
		...(query.data.conductorTempC !== undefined && { conductorTempC: query.data.conductorTempC }),
	};
	const key = `compare|${head.id}|${plans.map((p) => `${p.id}:${p.version}`).join(',')}|${currency}|${keyPart(scenario)}`;
	return cachedEngineJson(request, key, () =>
		runEngine('compare', {
			currency,
			head: { id: head.id, number: head.number, message: head.message, document: head.document },
			plans: plans.map((p) => ({
				id: p.id,
				name: p.name,
				document: p.document,
				cost: partsTotalMinor(p.parts) / 100,
			})),
			scenario,
		}),
	);
};
