import type { APIRoute } from 'astro';
import Papa from 'papaparse';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/authz';
import { findRuns } from '@/lib/server/db/runs';

/** The team's runs (or one vehicle's) as CSV. */
export const GET: APIRoute = async ({ params, locals, url }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const vehicleId = parseUuid(url.searchParams.get('vehicleId')) ?? undefined;
	const runs = await findRuns(locals.db, auth.access.teamId, { vehicleId });
	const csv = Papa.unparse(
		runs.map((r) => ({
			ran_at: r.ranAt,
			vehicle: r.vehicleName,
			event: r.eventName ?? '',
			revision: r.revisionNumber ?? '',
			score_db: r.scoreDb ?? '',
			frequency_hz: r.frequencyHz ?? '',
			resting_v: r.restingV ?? '',
			min_v: r.minV ?? '',
			ambient_c: r.ambientC ?? '',
			notes: r.notes,
		})),
		{ columns: ['ran_at', 'vehicle', 'event', 'revision', 'score_db', 'frequency_hz', 'resting_v', 'min_v', 'ambient_c', 'notes'], escapeFormulae: true },
	);
	return new Response(csv, { headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': 'attachment; filename="runs.csv"' } });
};
