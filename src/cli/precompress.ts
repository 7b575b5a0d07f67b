import { readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { brotliCompressSync, constants, gzipSync } from 'node:zlib';

/** What compresses: text formats. Images and fonts are compressed already. */
export const PRECOMPRESSED_TYPES: Record<string, string> = {
	'.js': 'text/javascript; charset=utf-8',
	'.mjs': 'text/javascript; charset=utf-8',
	'.css': 'text/css; charset=utf-8',
	'.svg': 'image/svg+xml',
	'.json': 'application/json',
	'.webmanifest': 'application/manifest+json',
	'.txt': 'text/plain; charset=utf-8',
	'.xml': 'application/xml',
};

function* files(dir: string): Generator<string> {
	for (const entry of readdirSync(dir, { withFileTypes: true })) {
		const full = path.join(dir, entry.name);
		if (entry.isDirectory()) yield* files(full);
		else yield full;
	}
}

/**
 * Writes `.br` (quality 11) and `.gz` (level 9) beside every compressible static file of the
 * build over 1 KB, once at build time, so the server sends them without compressing per request.
 * Returns how many files were compressed.
 */
export function precompress(clientDir: string): number {
	let count = 0;
	for (const file of files(clientDir)) {
		if (!(path.extname(file) in PRECOMPRESSED_TYPES) || statSync(file).size < 1024) continue;
		const body = readFileSync(file);
		writeFileSync(
			`${file}.br`,
			brotliCompressSync(body, {
				params: {
					[constants.BROTLI_PARAM_QUALITY]: 11,
					[constants.BROTLI_PARAM_SIZE_HINT]: body.length,
				},
			}),
		);
		writeFileSync(`${file}.gz`, gzipSync(body, { level: 9 }));
		count++;
	}
	return count;
}
