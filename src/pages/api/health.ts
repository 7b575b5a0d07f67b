import type { APIRoute } from 'astro';
import { checkDatabase, type HealthReport } from '@/lib/server/health';
import { problem } from '@/lib/server/http';
import { APP_VERSION } from '@/lib/version';

export const GET: APIRoute = async ({ locals }) => {
	try {
		const database = await checkDatabase(locals.db);
		const body: HealthReport = { status: 'ok', version: APP_VERSION, database };
		return Response.json(body, { headers: { 'cache-control': 'no-store' } });
	} catch (error) {
		console.error('health: database check failed', error);
		return problem(503, 'database_unavailable', 'The database did not answer', undefined, {
			'cache-control': 'no-store',
			'retry-after': '5',
		});
	}
};
