import type { APIRoute } from 'astro';
import Papa from 'papaparse';
import { runListQuerySchema } from '@/lib/schemas/runs';
import { RUN_MEASUREMENTS, MEASUREMENT_FIELDS } from '@/lib/schemas/run-measurements';
import { readQuery } from '@/lib/server/http';
import { requireTeamRole } from '@/lib/server/access';
import { findRuns } from '@/lib/server/db/runs';
import { runVoltage } from '@/lib/run-figures';

/** The team's runs (or one vehicle's) as CSV. */
export const GET: APIRoute = async ({ params, locals, url }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const query = readQuery(url, runListQuerySchema);
	if (!query.ok) return query.response;
	const runs = await findRuns(locals.db, auth.value.teamId, query.data);
	const csv = Papa.unparse(
		runs.map((r) => ({
			ran_at: r.ranAt,
			vehicle: r.vehicleName,
			event: r.eventName ?? '',
			revision: r.revisionNumber ?? '',
			// Voltages from the logger file where the run has one; what was typed in its own column.
			...Object.fromEntries(
				MEASUREMENT_FIELDS.map((f) => [
					RUN_MEASUREMENTS[f].column,
					(f === 'restingV' || f === 'minV' ? runVoltage(r, f).value : r[f]) ?? '',
				]),
			),
			resting_v_typed: r.restingV ?? '',
			min_v_typed: r.minV ?? '',
			voltages_from: r.logger ? 'logger' : 'typed',
			notes: r.notes,
		})),
		{
			columns: [
				'ran_at',
				'vehicle',
				'event',
				'revision',
				...MEASUREMENT_FIELDS.map((f) => RUN_MEASUREMENTS[f].column),
				'resting_v_typed',
				'min_v_typed',
				'voltages_from',
				'notes',
			],
			escapeFormulae: true,
		},
	);
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': 'attachment; filename="runs.csv"',
		},
	});
};
