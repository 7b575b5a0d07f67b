import type { APIRoute } from 'astro';
import { scenarioQuerySchema } from '@/lib/schemas/vehicles';
import { requireRevision } from '@/lib/server/access';
import { cachedEngineJson, keyPart } from '@/lib/server/engine/cache';
import { runEngine } from '@/lib/server/engine/pool';
import { readQuery } from '@/lib/server/http';

/**
 * The power-budget report of a saved revision, computed on the server by the shared engine. A
 * revision never changes, so the answer is cached by (revision, scenario) and carries an ETag.
 */
export const GET: APIRoute = async ({ params, locals, url, request }) => {
	const found = await requireRevision(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const { revision } = found.value;
	const query = readQuery(url, scenarioQuerySchema);
	if (!query.ok) return query.response;
	const scenario = Object.fromEntries(
		Object.entries(query.data).filter(([, v]) => v !== undefined),
	);
	return cachedEngineJson(request, `report|${revision.id}|${keyPart(scenario)}`, () =>
		runEngine('report', {
			revisionId: revision.id,
			number: revision.number,
			document: revision.document,
			scenario,
		}),
	);
};
