import type { APIRoute } from 'astro';
import { checkDatabase, checkStorage, type HealthReport } from '@/lib/server/health';
import { APP_VERSION } from '@/lib/version';
import { log } from '@/lib/server/log';

/**
 * The database and the file store, each asked once with a deadline: 200 when both answer, 503
 * (with which one is down) otherwise, so a load balancer takes a broken instance out.
 */
export const GET: APIRoute = async ({ locals }) => {
	const [database, storage] = await Promise.all([
		checkDatabase(locals.db),
		checkStorage(locals.storage),
	]);
	const ok = database.status === 'ok' && storage.status === 'ok';
	const body: HealthReport = {
		status: ok ? 'ok' : 'degraded',
		version: APP_VERSION,
		database,
		storage,
	};
	if (!ok)
		log.warn(
			{
				database: database.status,
				storage: storage.status,
				detail: [database.detail, storage.detail],
			},
			'health: a service is down',
		);
	return new Response(
		JSON.stringify(
			ok
				? body
				: {
						...body,
						health: body.status,
						type: 'about:blank',
						title: 'Service Unavailable',
						status: 503,
						code: database.status === 'down' ? 'database_unavailable' : 'storage_unavailable',
						detail: 'A service the app needs is not answering',
					},
		),
		{
			status: ok ? 200 : 503,
			headers: {
				'content-type': ok ? 'application/json' : 'application/problem+json',
				'cache-control': 'no-store',
				...(ok ? {} : { 'retry-after': '5' }),
			},
		},
	);
};
