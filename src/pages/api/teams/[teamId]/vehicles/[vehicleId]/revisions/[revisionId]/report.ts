import type { APIRoute } from 'astro';
import { buildReport } from '@/engine/report';
import { scenarioQuerySchema } from '@/lib/schemas/vehicles';
import { problem, toFieldErrors } from '@/lib/server/http';
import { requireRevision } from '@/lib/server/vehicle-access';

/** The power-budget report of a saved revision, computed on the server by the shared engine. */
export const GET: APIRoute = async ({ params, locals, url }) => {
	const found = await requireRevision(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const { revision } = found.value;
	const scenario = scenarioQuerySchema.safeParse(Object.fromEntries(url.searchParams));
	if (!scenario.success) return problem(400, 'invalid_input', 'Some scenario settings need attention', toFieldErrors(scenario.error));
	const clean = Object.fromEntries(Object.entries(scenario.data).filter(([, v]) => v !== undefined));
	return Response.json({ revisionId: revision.id, number: revision.number, report: buildReport(revision.document, clean) });
};
