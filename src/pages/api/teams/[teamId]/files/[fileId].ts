import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/access';
import { findTeamFile } from '@/lib/server/db/files';
import { problem } from '@/lib/server/http';
import { sniffImage } from '@/lib/server/file-content';

/** Header-safe file name: ASCII fallback plus the RFC 5987 form for the real one. */
function disposition(kind: 'inline' | 'attachment', name: string): string {
	const ascii = name.replace(/[^\w. -]+/g, '_').slice(0, 150) || 'file';
	return `${kind}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name.slice(0, 150))}`;
}

/**
 * A stored file of the team (photo, thumbnail, original logger file), from storage. An image is
 * served inline only when its bytes are the image type it was stored as; anything else goes out as
 * an attachment of an opaque type. Every answer forbids sniffing and runs in a CSP sandbox, so no
 * stored file can ever run script at the app's address.
 */
export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const id = parseUuid(params.fileId);
	const file = id && (await findTeamFile(locals.db, auth.value.teamId, id));
	if (!file) return problem(404, 'not_found', 'No such file');
	const body = await locals.storage.get(file.object_key);
	if (!body) return problem(404, 'not_found', 'The file is missing from storage');
	const image = file.kind !== 'logger' ? sniffImage(body) : null;
	const inline = image !== null && image === file.content_type;
	const type = inline
		? image
		: file.kind === 'logger'
			? 'text/csv; charset=utf-8'
			: 'application/octet-stream';
	return new Response(Buffer.from(body), {
		headers: {
			'content-type': type,
			'content-length': String(body.byteLength),
			'cache-control': 'private, max-age=3600',
			'content-disposition': disposition(inline ? 'inline' : 'attachment', file.file_name),
			'x-content-type-options': 'nosniff',
			'content-security-policy':
				"default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox",
			'cross-origin-resource-policy': 'same-origin',
		},
	});
};
