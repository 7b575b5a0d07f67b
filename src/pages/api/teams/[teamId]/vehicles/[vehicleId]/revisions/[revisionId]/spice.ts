import type { APIRoute } from 'astro';
import { DEFAULT_SCENARIO, toSpiceNetlist } from '@/engine';
import { scenarioQuerySchema } from '@/lib/schemas/vehicles';
import { readQuery } from '@/lib/server/http';
import { requireRevision } from '@/lib/server/access';

/** The revision as a SPICE netlist (DC operating point at burp demand), for any circuit simulator. */
export const GET: APIRoute = async ({ params, locals, url }) => {
	const found = await requireRevision(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const { revision } = found.value;
	const q = readQuery(url, scenarioQuerySchema);
	if (!q.ok) return q.response;
	const conditions = {
		engineRpm: q.data.engineRpm ?? DEFAULT_SCENARIO.engineRpm,
		demand: q.data.burpDemand ?? DEFAULT_SCENARIO.burpDemand,
		conductorTempC: q.data.conductorTempC ?? DEFAULT_SCENARIO.conductorTempC,
	};
	const { netlist } = toSpiceNetlist(revision.document, conditions, {
		title: `${found.value.vehicle.name} revision ${revision.number}`,
		nodeset: 'unloaded',
	});
	return new Response(netlist, {
		headers: {
			'content-type': 'text/plain; charset=utf-8',
			'content-disposition': `attachment; filename="${found.value.vehicle.name.replace(/[^\w-]+/g, '_')}-r${revision.number}.cir"`,
		},
	});
};
