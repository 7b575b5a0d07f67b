import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as healthEndpoint from '../../src/pages/api/health';
import { createDb } from '../../src/lib/server/db/client';
import { callEndpoint } from '../helpers/container';
import { memoryStorage } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

describe('GET /api/health', () => {
	let testDb: TestDb;

	beforeAll(async () => {
		testDb = await createTestDb();
	});
	afterAll(async () => {
		await testDb?.drop();
	});

	it('reports the version and a real database round trip when the database answers', async () => {
		const response = await callEndpoint(healthEndpoint, {
			locals: { db: testDb.db, storage: memoryStorage() },
			request: new Request('http://localhost/api/health'),
		});
		expect(response.status).toBe(200);
		const body = await response.json();
		expect(body.status).toBe('ok');
		expect(body.version).toMatch(/^\d+\.\d+\.\d+/);
		expect(body.database.status).toBe('ok');
		expect(body.database.serverVersion).toMatch(/^\d+/);
	});

	it('answers 503 problem JSON when the database is unreachable', async () => {
		// Nothing listens on port 1 on loopback.
		const deadDb = createDb('postgres://postgres@127.0.0.1:1/none', 1);
		try {
			const response = await callEndpoint(healthEndpoint, {
				locals: { db: deadDb, storage: memoryStorage() },
				request: new Request('http://localhost/api/health'),
			});
			expect(response.status).toBe(503);
			expect(response.headers.get('content-type')).toBe('application/problem+json');
			expect(await response.json()).toMatchObject({ status: 503, code: 'database_unavailable' });
		} finally {
			await deadDb.destroy();
		}
	});
});
