import type { APIRoute } from 'astro';
import { requireTeamRole } from '@/lib/server/access';
import { exportTeam } from '@/lib/server/team-backup';

/** The whole team as one versioned backup file (viewers and up). */
export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const backup = await exportTeam(locals.db, locals.storage, auth.value.teamId);
	const slug =
		auth.value.teamName
			.toLowerCase()
			.replace(/[^a-z0-9]+/g, '-')
			.replace(/^-|-$/g, '') || 'team';
	return new Response(JSON.stringify(backup), {
		headers: {
			'content-type': 'application/json; charset=utf-8',
			'content-disposition': `attachment; filename="sagwise-${slug}-${backup.exportedAt.slice(0, 10)}.json"`,
			'cache-control': 'no-store',
		},
	});
};
