// @vitest-environment jsdom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { api, ApiError } from '@/lib/client/api-client';

afterEach(() => vi.unstubAllGlobals());

const answer = (status: number, body: unknown, type = 'application/problem+json') =>
	vi.fn(
		async () =>
			new Response(body === null ? null : JSON.stringify(body), {
				status,
				headers: { 'content-type': type },
			}),
	);

describe('the one fetcher', () => {
	it('sends JSON and reads JSON back', async () => {
		const fetch = answer(201, { id: 'r1' }, 'application/json');
		vi.stubGlobal('fetch', fetch);
		await expect(api<{ id: string }>('/api/x', { json: { a: 1 } })).resolves.toEqual({ id: 'r1' });
		const [, init] = fetch.mock.calls[0] as unknown as [string, RequestInit];
		expect(init.method).toBe('POST');
		expect(init.body).toBe('{"a":1}');
		expect((init.headers as Record<string, string>)['content-type']).toBe('application/json');
	});

	it('turns a problem answer into an ApiError with its words and field errors', async () => {
		vi.stubGlobal(
			'fetch',
			answer(400, {
				code: 'invalid_input',
				detail: 'Fix the marked fields',
				errors: [{ path: 'lengthM', message: 'Length must be a number' }],
			}),
		);
		const error = await api('/api/x', { method: 'PATCH', json: {} }).catch((e) => e);
		expect(error).toBeInstanceOf(ApiError);
		expect(error).toMatchObject({
			status: 400,
			code: 'invalid_input',
			message: 'Fix the marked fields',
		});
		expect((error as ApiError).byField()).toEqual({ lengthM: 'Length must be a number' });
	});

	it('answers 204 with nothing, and a page that is not JSON with the status in words', async () => {
		vi.stubGlobal('fetch', answer(204, null));
		await expect(api('/api/x', { method: 'DELETE' })).resolves.toBeUndefined();
		vi.stubGlobal(
			'fetch',
			vi.fn(async () => new Response('<html>bad gateway</html>', { status: 502 })),
		);
		await expect(api('/api/x')).rejects.toMatchObject({
			status: 502,
			code: 'internal',
			message: 'The server answered 502',
		});
	});

	it('reports a lost connection as an ApiError, not a bare TypeError', async () => {
		vi.stubGlobal(
			'fetch',
			vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))),
		);
		await expect(api('/api/x')).rejects.toMatchObject({ status: 0, code: 'network' });
	});
});
