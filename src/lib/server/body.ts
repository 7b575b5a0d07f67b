import { Readable } from 'node:stream';
import busboy, { type Busboy } from 'busboy';
import { problem, type ReadResult } from './http';

/** The largest JSON body any route takes (a 2,000-part build document fits with room to spare). */
export const MAX_JSON_BYTES = 2 * 1024 * 1024;

export class BodyTooLargeError extends Error {
	override readonly name = 'BodyTooLargeError';
	constructor(readonly limit: number) {
		super(`The request body is larger than ${limit} bytes`);
	}
}

/**
 * Reads a request body into memory, but never more than `limit` bytes: a declared length above it
 * is refused before a byte is read, and a body without a length (chunked) is cut off as soon as it
 * passes the limit, so a huge upload never sits in the server's memory.
 */
export async function readBytes(request: Request, limit: number): Promise<Uint8Array> {
	const declared = request.headers.get('content-length');
	if (declared !== null && Number(declared) > limit) {
		await request.body?.cancel().catch(() => undefined);
		throw new BodyTooLargeError(limit);
	}
	if (!request.body) return new Uint8Array(0);
	const reader = request.body.getReader();
	const chunks: Uint8Array[] = [];
	let total = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		total += value.byteLength;
		if (total > limit) {
			await reader.cancel().catch(() => undefined);
			throw new BodyTooLargeError(limit);
		}
		chunks.push(value);
	}
	const out = new Uint8Array(total);
	let offset = 0;
	for (const c of chunks) {
		out.set(c, offset);
		offset += c.byteLength;
	}
	return out;
}

const sizeLabel = (bytes: number) =>
	bytes >= 1024 * 1024 ? `${Math.round(bytes / 1024 / 1024)} MB` : `${Math.round(bytes / 1024)} KB`;

/** A multipart form read within a limit: 415 when not multipart, 413 past the limit, 400 when malformed. */
export async function readMultipart(
	request: Request,
	limit: number,
	tooLarge?: string,
): Promise<ReadResult<FormData>> {
	const type = request.headers.get('content-type') ?? '';
	if (!type.toLowerCase().startsWith('multipart/form-data'))
		return {
			ok: false,
			response: problem(415, 'unsupported_media_type', 'Send the file as multipart/form-data'),
		};
	let bytes: Uint8Array;
	try {
		bytes = await readBytes(request, limit);
	} catch (error) {
		if (error instanceof BodyTooLargeError)
			return {
				ok: false,
				response: problem(
					413,
					'too_large',
					tooLarge ?? `The upload is larger than ${sizeLabel(limit)}`,
				),
			};
		return {
			ok: false,
			response: problem(400, 'invalid_input', 'The upload was cut short', [
				{ path: 'file', message: 'Incomplete upload' },
			]),
		};
	}
	try {
		return {
			ok: true,
			data: await new Response(bytes as unknown as BodyInit, {
				headers: { 'content-type': type },
			}).formData(),
		};
	} catch {
		return {
			ok: false,
			response: problem(400, 'invalid_input', 'The upload is not a readable multipart form', [
				{ path: 'file', message: 'Malformed form data' },
			]),
		};
	}
}

export { sizeLabel };

/**
 * Reads a multipart upload as it arrives, handing its one file to `consume` as a stream of bytes
 * (the file is never held whole: a team backup can be tens of megabytes) and collecting its small
 * text fields. A declared length over `limit` is refused before anything is read; a file over it
 * answers 413 however it was sent. Whatever `consume` leaves unread is drained, not kept.
 */
export async function streamMultipartFile<T>(
	request: Request,
	{ limit, tooLarge, fileField = 'file' }: { limit: number; tooLarge: string; fileField?: string },
	consume: (file: AsyncIterable<Uint8Array>) => Promise<T>,
): Promise<ReadResult<{ result: T | null; fields: Record<string, string> }>> {
	const type = request.headers.get('content-type') ?? '';
	if (!type.toLowerCase().startsWith('multipart/form-data'))
		return {
			ok: false,
			response: problem(415, 'unsupported_media_type', 'Send the file as multipart/form-data'),
		};
	const declared = request.headers.get('content-length');
	if (declared !== null && Number(declared) > limit + 64 * 1024) {
		await request.body?.cancel().catch(() => undefined);
		return { ok: false, response: problem(413, 'too_large', tooLarge) };
	}
	if (!request.body)
		return {
			ok: false,
			response: problem(400, 'invalid_input', 'Attach the file', [
				{ path: fileField, message: 'No file' },
			]),
		};
	const fields: Record<string, string> = {};
	let truncated = false;
	let consumed: Promise<T> | null = null;
	let parser: Busboy;
	try {
		parser = busboy({
			headers: { 'content-type': type },
			limits: { files: 1, fileSize: limit, fields: 20, fieldSize: 8 * 1024, parts: 40 },
		});
	} catch {
		return {
			ok: false,
			response: problem(400, 'invalid_input', 'The upload is not a readable multipart form', [
				{ path: fileField, message: 'Malformed form data' },
			]),
		};
	}
	parser.on('field', (name, value) => {
		if (!Object.hasOwn(fields, name)) fields[name] = value;
	});
	parser.on('file', (name, stream) => {
		stream.on('limit', () => (truncated = true));
		if (name !== fileField || consumed) {
			stream.resume();
			return;
		}
		const bytes = (async function* () {
			try {
				for await (const chunk of stream.iterator({ destroyOnReturn: false }))
					yield chunk as Uint8Array;
			} finally {
				stream.resume();
			}
		})();
		consumed = consume(bytes);
	});
	const done = new Promise<void>((resolve, reject) => {
		parser.on('close', resolve);
		parser.on('error', reject);
	});
	const source = Readable.fromWeb(request.body as import('node:stream/web').ReadableStream);
	source.on('error', (e) => parser.destroy(e));
	source.pipe(parser);
	let result: T | null = null;
	try {
		await done;
		result = consumed ? await consumed : null;
	} catch {
		// Still settle what the file went to, so nothing is left pending.
		await (consumed as Promise<T> | null)?.catch(() => undefined);
		return {
			ok: false,
			response: problem(
				400,
				'invalid_input',
				'The upload was cut short or is not a readable form',
				[{ path: fileField, message: 'Incomplete or malformed upload' }],
			),
		};
	}
	if (truncated) return { ok: false, response: problem(413, 'too_large', tooLarge) };
	return { ok: true, data: { result, fields } };
}
