import type { APIRoute } from 'astro';
import { removeTeamObjects } from '@/lib/server/object-cleanup';
import { deleteTeamSchema, renameTeamSchema } from '@/lib/schemas/account';
import { requireTeamRole } from '@/lib/server/access';
import {
	deleteTeam,
	findTeamSettings,
	renameTeam,
	teamHasMoney,
	updateTeamSettings,
} from '@/lib/server/db/teams';
import { problem, readJson } from '@/lib/server/http';

export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	return Response.json(await findTeamSettings(locals.db, auth.value));
};

export const PATCH: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, renameTeamSchema);
	if (!body.ok) return body.response;
	if (body.data.currency !== undefined) {
		const { currency } = await findTeamSettings(locals.db, auth.value);
		if (currency !== body.data.currency && (await teamHasMoney(locals.db, auth.value.teamId)))
			return problem(
				409,
				'conflict',
				`Prices are recorded in ${currency}; the currency cannot change once money is recorded`,
				[{ path: 'currency', message: `Prices are recorded in ${currency}` }],
			);
	}
	if (body.data.name !== undefined) await renameTeam(locals.db, auth.value.teamId, body.data.name);
	await updateTeamSettings(locals.db, auth.value.teamId, body.data);
	return new Response(null, { status: 204 });
};

/** Deletes the team and everything in it; the body must repeat the team's name. */
export const DELETE: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'captain');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, deleteTeamSchema);
	if (!body.ok) return body.response;
	if (body.data.confirmName.trim() !== auth.value.teamName) {
		return problem(400, 'confirmation_mismatch', 'Type the team name exactly to delete it', [
			{ path: 'confirmName', message: 'Does not match the team name' },
		]);
	}
	await deleteTeam(locals.db, auth.value.teamId);
	await removeTeamObjects(locals.storage, auth.value.teamId);
	return new Response(null, { status: 204 });
};
