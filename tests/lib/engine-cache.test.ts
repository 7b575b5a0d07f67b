import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import {
	ComputeRefused,
	acceptedEncoding,
	cachedEngineJson,
} from '../../src/lib/server/engine/cache';

describe('cached engine answers', () => {
	it('picks brotli, then gzip, as the request accepts them (RFC 9110 §12.5.3; q=0 refuses)', () => {
		expect(acceptedEncoding('gzip, deflate, br')).toBe('br');
		expect(acceptedEncoding('gzip')).toBe('gzip');
		expect(acceptedEncoding('br;q=0, gzip;q=0.5')).toBe('gzip');
		expect(acceptedEncoding('identity')).toBeNull();
		expect(acceptedEncoding(null)).toBeNull();
	});

	it('computes once, then answers compressed bodies that decode to the same JSON', async () => {
		let computed = 0;
		const json = JSON.stringify({ figures: Array.from({ length: 500 }, (_, i) => i * 0.125) });
		const compute = async () => {
			computed++;
			return json;
		};
		const key = `test|${Date.now()}`;
		const ask = (accept: string) =>
			cachedEngineJson(
				new Request('http://x/', { headers: { 'accept-encoding': accept } }),
				key,
				compute,
			);
		const br = await ask('gzip, br');
		expect(br.headers.get('content-encoding')).toBe('br');
		expect(brotliDecompressSync(Buffer.from(await br.arrayBuffer())).toString()).toBe(json);
		const gz = await ask('gzip');
		expect(gunzipSync(Buffer.from(await gz.arrayBuffer())).toString()).toBe(json);
		const plain = await ask('identity');
		expect(plain.headers.get('content-encoding')).toBeNull();
		await expect(plain.text()).resolves.toBe(json);
		expect(computed).toBe(1);
		// The ETag answers 304 without a body.
		const again = await cachedEngineJson(
			new Request('http://x/', { headers: { 'if-none-match': br.headers.get('etag')! } }),
			key,
			compute,
		);
		expect(again.status).toBe(304);
	});

	it('answers a refused computation with its own response and caches nothing for the key', async () => {
		const key = `refused|${Date.now()}`;
		const request = new Request('http://x/');
		const refused = await cachedEngineJson(request, key, async () => {
			throw new ComputeRefused(() => new Response('{"error":"conflict"}', { status: 409 }));
		});
		expect(refused.status).toBe(409);
		// The next ask computes afresh: the refusal was not kept.
		const next = await cachedEngineJson(request, key, async () => '{"ok":true}');
		expect(next.status).toBe(200);
		await expect(next.json()).resolves.toEqual({ ok: true });
	});
});
