import type { APIRoute } from 'astro';
import { scenarioQuerySchema } from '@/lib/schemas/vehicles';
import { requireRevisionId } from '@/lib/server/access';
import { findRevision } from '@/lib/server/db/builds';
import { ComputeRefused, cachedEngineJson, keyPart } from '@/lib/server/engine/cache';
import { runEngine } from '@/lib/server/engine/pool';
import { problem, readQuery } from '@/lib/server/http';
import { canonicalScenario } from '@/lib/scenario-steps';

/**
 * The power-budget report of a saved revision, computed on the server by the shared engine. A
 * revision never changes, so the answer is cached by (revision, canonical scenario) and carries an ETag; the
 * revision's document is read only when the report has to be computed.
 */
export const GET: APIRoute = async ({ params, locals, url, request }) => {
	const found = await requireRevisionId(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const { revisionId, build } = found.value;
	const query = readQuery(url, scenarioQuerySchema);
	if (!query.ok) return query.response;
	// Computed for, and kept under, the conditions on the steps the form offers.
	const scenario = canonicalScenario(query.data);
	return cachedEngineJson(request, `report|${revisionId}|${keyPart(scenario)}`, async (signal) => {
		const revision = await findRevision(locals.db, build.id, revisionId);
		if (!revision) throw new ComputeRefused(() => problem(404, 'not_found', 'No such revision'));
		return runEngine(
			'report',
			{
				revisionId: revision.id,
				number: revision.number,
				document: revision.document,
				scenario,
			},
			{ team: found.value.access.teamId, signal },
		);
	});
};
