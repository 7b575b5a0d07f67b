import type { APIRoute } from 'astro';
import { requireTeamRole } from '@/lib/server/access';
import { findShelf } from '@/lib/server/db/shelf';
import { shelfToCsv } from '@/lib/server/shelf-csv';

/** The team's shelf as CSV (the same columns the import reads). */
export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	return new Response(shelfToCsv(await findShelf(locals.db, auth.value.teamId)), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': 'attachment; filename="shelf.csv"',
			'cache-control': 'private, no-store',
		},
	});
};
