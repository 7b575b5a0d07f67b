import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/access';
import { deletePurchase, findSeason } from '@/lib/server/db/seasons';
import { problem } from '@/lib/server/http';
import { removeObjects } from '@/lib/server/object-cleanup';

/** Deletes a purchase and its receipt photo. */
export const DELETE: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const seasonId = parseUuid(params.seasonId);
	const id = parseUuid(params.purchaseId);
	const season = seasonId ? await findSeason(locals.db, auth.value.teamId, seasonId) : null;
	const receipts = season && id ? await deletePurchase(locals.db, season.id, id) : null;
	if (!receipts) return problem(404, 'not_found', 'No such purchase in this season');
	await removeObjects(locals.storage, receipts);
	return new Response(null, { status: 204 });
};
