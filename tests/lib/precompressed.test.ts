import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { precompress } from '../../src/cli/precompress';
import { createFront } from '../../src/cli/serve';

describe('precompressed static files', () => {
	const dir = mkdtempSync(path.join(tmpdir(), 'sagwise-static-'));
	const script = `export const words = ${JSON.stringify('volts and amps '.repeat(400))};\n`;
	let server: http.Server;
	let base: string;
	beforeAll(async () => {
		mkdirSync(path.join(dir, '_astro'));
		writeFileSync(path.join(dir, '_astro', 'app.abc123.js'), script);
		writeFileSync(path.join(dir, '_astro', 'tiny.def456.js'), 'export {};\n');
		expect(precompress(dir)).toBe(1); // the tiny file is left as it is
		// The Astro handler stands in as "anything else": it answers plainly.
		const astro = (_req: http.IncomingMessage, res: http.ServerResponse) => {
			res.writeHead(200, { 'content-type': 'text/plain' });
			res.end('from astro');
		};
		server = http.createServer(createFront(astro, {}, dir));
		await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
		base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
	});
	afterAll(async () => new Promise<void>((r) => server.close(() => r())));

	const get = (p: string, accept: string, method = 'GET') =>
		new Promise<{ status: number; headers: http.IncomingHttpHeaders; body: Buffer }>(
			(resolve, reject) => {
				const req = http.request(
					`${base}${p}`,
					{ method, headers: { 'accept-encoding': accept } },
					(res) => {
						const chunks: Buffer[] = [];
						res.on('data', (c: Buffer) => chunks.push(c));
						res.on('end', () =>
							resolve({
								status: res.statusCode!,
								headers: res.headers,
								body: Buffer.concat(chunks),
							}),
						);
					},
				);
				req.on('error', reject);
				req.end();
			},
		);

	it('sends brotli when the browser takes it, as an immutable script', async () => {
		const r = await get('/_astro/app.abc123.js', 'gzip, deflate, br');
		expect(r.headers['content-encoding']).toBe('br');
		expect(r.headers['content-type']).toMatch(/javascript/);
		expect(r.headers['cache-control']).toContain('immutable');
		expect(r.headers.vary).toBe('Accept-Encoding');
		expect(brotliDecompressSync(r.body).toString()).toBe(script);
		expect(Number(r.headers['content-length'])).toBe(r.body.length);
	});

	it('sends gzip to a browser without brotli, or one that refuses it with q=0', async () => {
		for (const accept of ['gzip', 'br;q=0, gzip']) {
			const r = await get('/_astro/app.abc123.js', accept);
			expect(r.headers['content-encoding'], accept).toBe('gzip');
			expect(gunzipSync(r.body).toString()).toBe(script);
		}
	});

	it('leaves the rest to the app: no accepted encoding, a file not precompressed, a HEAD has no body', async () => {
		expect((await get('/_astro/app.abc123.js', 'identity')).body.toString()).toBe('from astro');
		// The app's own compressor may still compress what the app sends.
		const tiny = await get('/_astro/tiny.def456.js', 'br');
		expect(brotliDecompressSync(tiny.body).toString()).toBe('from astro');
		// Only the names found at start are served from disk: anything else is the app's to answer.
		expect((await get('/_astro/other.js', 'identity')).body.toString()).toBe('from astro');
		const head = await get('/_astro/app.abc123.js', 'br', 'HEAD');
		expect(head.headers['content-encoding']).toBe('br');
		expect(head.body.length).toBe(0);
	});
});
