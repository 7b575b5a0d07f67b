import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/authz';
import { problem } from '@/lib/server/http';

/** A stored file of the team (photo, thumbnail, original logger file), from storage. */
export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const id = parseUuid(params.fileId);
	const file = id && (await locals.db.selectFrom('stored_file').selectAll().where('team_id', '=', auth.access.teamId).where('id', '=', id).executeTakeFirst());
	if (!file) return problem(404, 'not_found', 'No such file');
	const body = await locals.storage.get(file.object_key);
	if (!body) return problem(404, 'not_found', 'The file is missing from storage');
	return new Response(Buffer.from(body), {
		headers: {
			'content-type': file.content_type,
			'content-length': String(body.byteLength),
			'cache-control': 'private, max-age=3600',
			'content-disposition': `${file.kind === 'logger' ? 'attachment' : 'inline'}; filename="${file.file_name.replace(/[^\w. -]+/g, '_')}"`,
			'x-content-type-options': 'nosniff',
		},
	});
};
