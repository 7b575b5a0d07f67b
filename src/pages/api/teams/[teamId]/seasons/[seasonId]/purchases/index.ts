import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { newPurchaseSchema } from '@/lib/schemas/seasons';
import { requireTeamRole } from '@/lib/server/access';
import { findSeason, insertPurchase } from '@/lib/server/db/seasons';
import { findShelfItem } from '@/lib/server/db/shelf';
import { findMembers } from '@/lib/server/db/teams';
import { problem, readJson } from '@/lib/server/http';

/** Records a purchase in the season: who paid must be one of the team's captains or members. */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const teamId = auth.value.teamId;
	const seasonId = parseUuid(params.seasonId);
	const season = seasonId ? await findSeason(locals.db, teamId, seasonId) : null;
	if (!season) return problem(404, 'not_found', 'No such season in this team');
	const body = await readJson(request, newPurchaseSchema);
	if (!body.ok) return body.response;
	const p = body.data;
	const payer = (await findMembers(locals.db, teamId)).find(
		(m) => m.userId === p.paidBy && m.role !== 'viewer',
	);
	if (!payer)
		return problem(400, 'invalid_input', 'Who paid must be a captain or member of the team', [
			{ path: 'paidBy', message: 'Not a captain or member of this team' },
		]);
	if (p.shelfItemId && !(await findShelfItem(locals.db, teamId, p.shelfItemId)))
		return problem(400, 'invalid_input', 'No such shelf entry in this team', [
			{ path: 'shelfItemId', message: 'Not an entry of this team’s shelf' },
		]);
	const id = await insertPurchase(locals.db, season.id, {
		...p,
		paidByName: payer.name || payer.email,
		createdBy: auth.value.userId,
	});
	return Response.json({ id }, { status: 201 });
};
