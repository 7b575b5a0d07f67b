import type { APIRoute } from 'astro';
import { buildReport } from '@/engine';
import { scenarioQuerySchema } from '@/lib/schemas/vehicles';
import { readQuery } from '@/lib/server/http';
import { requireRevision } from '@/lib/server/access';

/** The power-budget report of a saved revision, computed on the server by the shared engine. */
export const GET: APIRoute = async ({ params, locals, url }) => {
	const found = await requireRevision(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const { revision } = found.value;
	const scenario = readQuery(url, scenarioQuerySchema);
	if (!scenario.ok) return scenario.response;
	const clean = Object.fromEntries(
		Object.entries(scenario.data).filter(([, v]) => v !== undefined),
	);
	return Response.json({
		revisionId: revision.id,
		number: revision.number,
		report: buildReport(revision.document, clean),
	});
};
