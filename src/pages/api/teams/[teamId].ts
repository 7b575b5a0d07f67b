import type { APIRoute } from 'astro';
import { removeTeamObjects } from '@/lib/server/object-cleanup';
import { deleteTeamSchema, renameTeamSchema } from '@/lib/schemas/account';
import { requireTeamRole } from '@/lib/server/authz';
import { deleteTeam, renameTeam } from '@/lib/server/db/teams';
import { problem, readJson } from '@/lib/server/http';

export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const team = await locals.db.selectFrom('team').select(['currency', 'reminder_days', 'fuse_distance_m']).where('id', '=', auth.access.teamId).executeTakeFirstOrThrow();
	return Response.json({ id: auth.access.teamId, name: auth.access.teamName, role: auth.access.role, currency: team.currency, reminderDays: team.reminder_days, fuseDistanceM: team.fuse_distance_m });
};

export const PATCH: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, renameTeamSchema);
	if (!body.ok) return body.response;
	if (body.data.name !== undefined) await renameTeam(locals.db, auth.access.teamId, body.data.name);
	if (body.data.currency !== undefined) await locals.db.updateTable('team').set({ currency: body.data.currency }).where('id', '=', auth.access.teamId).execute();
	if (body.data.reminderDays !== undefined) await locals.db.updateTable('team').set({ reminder_days: body.data.reminderDays }).where('id', '=', auth.access.teamId).execute();
	return new Response(null, { status: 204 });
};

/** Deletes the team and everything in it; the body must repeat the team's name. */
export const DELETE: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, deleteTeamSchema);
	if (!body.ok) return body.response;
	if (body.data.confirmName.trim() !== auth.access.teamName) {
		return problem(400, 'confirmation_mismatch', 'Type the team name exactly to delete it', [{ path: 'confirmName', message: 'Does not match the team name' }]);
	}
	await deleteTeam(locals.db, auth.access.teamId);
	await removeTeamObjects(locals.storage, auth.access.teamId);
	return new Response(null, { status: 204 });
};
