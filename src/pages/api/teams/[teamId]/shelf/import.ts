import type { APIRoute } from 'astro';
import { requireTeamRole } from '@/lib/server/access';
import { BodyTooLargeError, MAX_JSON_BYTES, readBytes } from '@/lib/server/body';
import { addShelfItems, SHELF_LIMIT } from '@/lib/server/db/shelf';
import { problem } from '@/lib/server/http';
import { parseShelfCsv } from '@/lib/server/shelf-csv';

/**
 * Adds the entries of a shelf CSV (text/csv) to the team's shelf, all or none: any row in error
 * answers 400 naming each row and column, and nothing is added.
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const type = (request.headers.get('content-type') ?? '').toLowerCase();
	if (!type.startsWith('text/csv') && !type.startsWith('text/plain'))
		return problem(415, 'unsupported_media_type', 'Send the shelf as text/csv');
	let text: string;
	try {
		text = new TextDecoder('utf-8', { fatal: true }).decode(
			await readBytes(request, MAX_JSON_BYTES),
		);
	} catch (error) {
		if (error instanceof BodyTooLargeError)
			return problem(413, 'too_large', `The file is larger than ${MAX_JSON_BYTES / 1024} KB`);
		return problem(400, 'invalid_input', 'The file is not UTF-8 text');
	}
	const parsed = parseShelfCsv(text, SHELF_LIMIT);
	if (!parsed.ok)
		return problem(
			400,
			'invalid_input',
			'Some rows need attention; nothing was added',
			parsed.errors,
		);
	const added = await addShelfItems(locals.db, auth.value.teamId, parsed.items);
	if (!added)
		return problem(
			409,
			'conflict',
			`A shelf holds at most ${SHELF_LIMIT} entries; this file would pass that`,
		);
	return Response.json({ added: added.length }, { status: 201 });
};
