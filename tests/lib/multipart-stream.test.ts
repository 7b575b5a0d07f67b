import { describe, expect, it } from 'vitest';
import { streamMultipartFile } from '../../src/lib/server/body';

/** A multipart request as a browser sends it, optionally without its declared length (chunked). */
function upload(form: FormData, { chunked = false } = {}): Request {
	const request = new Request('http://localhost/upload', { method: 'POST', body: form });
	if (!chunked) return request;
	const headers = new Headers(request.headers);
	headers.delete('content-length');
	return new Request('http://localhost/upload', {
		method: 'POST',
		headers,
		body: request.body,
		duplex: 'half',
	} as RequestInit);
}

const sizeOf = async (file: AsyncIterable<Uint8Array>) => {
	let n = 0;
	for await (const chunk of file) n += chunk.byteLength;
	return n;
};

describe('streamMultipartFile', () => {
	it('hands the file over as a stream of its bytes, with the small fields', async () => {
		const form = new FormData();
		form.set('name', 'Harbour copy');
		form.set('file', new Blob([new Uint8Array(300_000).fill(65)]), 'backup.json');
		const read = await streamMultipartFile(
			upload(form),
			{ limit: 1_000_000, tooLarge: 'too big' },
			sizeOf,
		);
		expect(read.ok && read.data).toEqual({ result: 300_000, fields: { name: 'Harbour copy' } });
	});

	it('answers 413 for a file over the limit, with or without a declared length', async () => {
		for (const chunked of [false, true]) {
			const form = new FormData();
			form.set('file', new Blob([new Uint8Array(200_000)]), 'big.json');
			const read = await streamMultipartFile(
				upload(form, { chunked }),
				{ limit: 100_000, tooLarge: 'too big' },
				sizeOf,
			);
			expect(read.ok).toBe(false);
			if (!read.ok) expect(read.response.status).toBe(413);
		}
	});

	it('drains what the reader leaves unread and still reads the fields after it', async () => {
		const form = new FormData();
		form.set('file', new Blob([new Uint8Array(500_000)]), 'backup.json');
		form.set('name', 'After the file');
		const read = await streamMultipartFile(
			upload(form),
			{ limit: 1_000_000, tooLarge: 'too big' },
			async (file) => {
				for await (const chunk of file) return chunk.byteLength > 0;
				return false;
			},
		);
		expect(read.ok && read.data).toEqual({ result: true, fields: { name: 'After the file' } });
	});

	it('says no file when there is none, and refuses what is not a multipart form', async () => {
		const form = new FormData();
		form.set('name', 'No file');
		const none = await streamMultipartFile(upload(form), { limit: 1000, tooLarge: 'x' }, sizeOf);
		expect(none.ok && none.data.result).toBeNull();
		const json = await streamMultipartFile(
			new Request('http://localhost/upload', { method: 'POST', body: '{}' }),
			{ limit: 1000, tooLarge: 'x' },
			sizeOf,
		);
		expect(!json.ok && json.response.status).toBe(415);
		const broken = await streamMultipartFile(
			new Request('http://localhost/upload', {
				method: 'POST',
				headers: { 'content-type': 'multipart/form-data; boundary=xyz' },
				body: '--xyz\r\nContent-Disposition: form-data; name="file"; filename="a"\r\n\r\nhalf a file',
			}),
			{ limit: 1000, tooLarge: 'x' },
			sizeOf,
		);
		expect(!broken.ok && broken.response.status).toBe(400);
	});
});
