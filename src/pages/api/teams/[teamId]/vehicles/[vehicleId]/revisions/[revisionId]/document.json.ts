import type { APIRoute } from 'astro';
import { requireRevision } from '@/lib/server/access';

/** The revision's build document as a versioned JSON file, to keep or to load elsewhere. */
export const GET: APIRoute = async ({ params, locals }) => {
	const found = await requireRevision(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const { revision, vehicle } = found.value;
	return new Response(JSON.stringify(revision.document, null, 2), {
		headers: {
			'content-type': 'application/json; charset=utf-8',
			'content-disposition': `attachment; filename="${vehicle.name.replace(/[^\w-]+/g, '_')}-r${revision.number}.build.json"`,
		},
	});
};
