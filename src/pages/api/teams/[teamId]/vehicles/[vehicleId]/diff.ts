import type { APIRoute } from 'astro';
import { z } from '@/lib/zod';
import { findRevision } from '@/lib/server/db/builds';
import { problem, readQuery } from '@/lib/server/http';
import { requireVehicle } from '@/lib/server/access';
import { runEngine } from '@/lib/server/engine/pool';

const query = z.object({
	from: z.uuid({ error: 'from must be a revision id' }),
	to: z.uuid({ error: 'to must be a revision id' }),
});

/** Component-by-component changes between two revisions of the build. */
export const GET: APIRoute = async ({ params, locals, url, request }) => {
	const found = await requireVehicle(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const q = readQuery(url, query);
	if (!q.ok) return q.response;
	const [a, b] = await Promise.all([
		findRevision(locals.db, found.value.build.id, q.data.from),
		findRevision(locals.db, found.value.build.id, q.data.to),
	]);
	if (!a || !b) return problem(404, 'not_found', 'No such revision');
	const [changes] = await runEngine(
		'diffs',
		{ pairs: [{ before: a.document, after: b.document }] },
		{ team: found.value.access.teamId, signal: request.signal },
	);
	return Response.json({
		from: { id: a.id, number: a.number },
		to: { id: b.id, number: b.number },
		changes,
	});
};
