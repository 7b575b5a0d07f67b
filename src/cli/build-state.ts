import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';

const SOURCES = [
	'src',
	'db',
	'public',
	'astro.config.mjs',
	'auth.config.ts',
	'package-lock.json',
	'tsconfig.json',
];

function newestMtime(entry: string): number {
	if (!existsSync(entry)) return 0;
	const stat = statSync(entry);
	if (!stat.isDirectory()) return stat.mtimeMs;
	let newest = stat.mtimeMs;
	for (const child of readdirSync(entry))
		newest = Math.max(newest, newestMtime(path.join(entry, child)));
	return newest;
}

/** True when dist/ (the app and its HTTP front) is missing or older than any source file that goes into it. */
export function buildIsStale(root = process.cwd()): boolean {
	const entry = path.join(root, 'dist/server/entry.mjs');
	if (!existsSync(entry) || !existsSync(path.join(root, 'dist/serve.mjs'))) return true;
	const built = statSync(entry).mtimeMs;
	return SOURCES.some((source) => newestMtime(path.join(root, source)) > built);
}
