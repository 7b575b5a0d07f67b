import type { APIRoute } from 'astro';
import { deleteTeamSchema, renameTeamSchema } from '@/lib/schemas/account';
import { requireTeamRole } from '@/lib/server/authz';
import { deleteTeam, renameTeam } from '@/lib/server/db/teams';
import { problem, readJson } from '@/lib/server/http';

export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	return Response.json({ id: auth.access.teamId, name: auth.access.teamName, role: auth.access.role });
};

export const PATCH: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, renameTeamSchema);
	if (!body.ok) return body.response;
	if (body.data.name !== undefined) await renameTeam(locals.db, auth.access.teamId, body.data.name);
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
	return new Response(null, { status: 204 });
};
