import type { APIRoute } from 'astro';
import { requireTeamRole } from '@/lib/server/access';
import { errorField, log } from '@/lib/server/log';
import { exportTeamChunks } from '@/lib/server/team-backup';

/**
 * The whole team as one versioned backup file (viewers and up), streamed: it is read and written
 * a vehicle or a batch of runs at a time, each piece sent when the client has taken the last, so
 * a season's backup neither fills the server's memory nor holds other requests. A failure part
 * way (the file store down) ends the download unfinished (not valid JSON), which the import
 * refuses as unreadable; the server carries on.
 */
export const GET: APIRoute = async ({ params, locals, request }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	const chunks = exportTeamChunks(locals.db, locals.storage, auth.value.teamId);
	// The first piece is read before answering, so a database that is down answers 503, not a broken file.
	const first = await chunks.next();
	const encoder = new TextEncoder();
	const body = new ReadableStream<Uint8Array>({
		start(controller) {
			if (!first.done) controller.enqueue(encoder.encode(first.value));
		},
		async pull(controller) {
			if (request.signal.aborted) {
				await chunks.return(undefined);
				return controller.close();
			}
			try {
				const next = await chunks.next();
				if (next.done) controller.close();
				else controller.enqueue(encoder.encode(next.value));
			} catch (error) {
				// The answer has begun (200): the file ends unfinished, which no import accepts.
				log.error({ err: errorField(error) }, 'team export stopped part way');
				controller.close();
			}
		},
		async cancel() {
			await chunks.return(undefined);
		},
	});
	const slug =
		auth.value.teamName
			.toLowerCase()
			.replace(/[^a-z0-9]+/g, '-')
			.replace(/^-|-$/g, '') || 'team';
	return new Response(body, {
		headers: {
			'content-type': 'application/json; charset=utf-8',
			'content-disposition': `attachment; filename="sagwise-${slug}-${new Date().toISOString().slice(0, 10)}.json"`,
			'cache-control': 'no-store',
		},
	});
};
