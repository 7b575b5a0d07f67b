import type { APIRoute } from 'astro';
import { analyseRun } from '@/engine/run-analysis';
import { loggerMappingSchema } from '@/lib/schemas/events';
import { MAX_LOGGER_BYTES, parseLoggerCsv } from '@/lib/logger-csv';
import { requireRun } from '@/lib/server/runs';
import { problem, toFieldErrors } from '@/lib/server/http';

/** Bytes that mark binary files (images, archives) which are not a logger CSV, whatever their name. */
function looksBinary(bytes: Uint8Array): boolean {
	const head = bytes.subarray(0, 8);
	const sig = (...b: number[]) => b.every((x, i) => head[i] === x);
	if (sig(0xff, 0xd8, 0xff) || sig(0x89, 0x50, 0x4e, 0x47) || sig(0x52, 0x49, 0x46, 0x46) || sig(0x50, 0x4b, 0x03, 0x04) || sig(0x47, 0x49, 0x46)) return true;
	return bytes.subarray(0, 4096).includes(0);
}

/**
 * Uploads a logger file (multipart: `file` plus the column mapping). The file is checked by its
 * content, parsed, stored in S3 and its samples written to PostgreSQL in one transaction; a file
 * that fails any check stores nothing and says which row and why.
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const found = await requireRun(locals, params, 'member');
	if (!found.ok) return found.response;
	const { access, run } = found;
	if (!(request.headers.get('content-type') ?? '').startsWith('multipart/form-data')) {
		return problem(415, 'unsupported_media_type', 'Send the file as multipart/form-data');
	}
	const declared = Number(request.headers.get('content-length') ?? 0);
	if (declared > MAX_LOGGER_BYTES + 64 * 1024) return problem(413, 'invalid_input', `Logger files are limited to ${MAX_LOGGER_BYTES / 1024 / 1024} MB`);
	const form = await request.formData().catch(() => null);
	const file = form?.get('file');
	if (!form || !(file instanceof File)) return problem(400, 'invalid_input', 'Attach the logger file', [{ path: 'file', message: 'No file' }]);
	if (file.size > MAX_LOGGER_BYTES) return problem(413, 'invalid_input', `Logger files are limited to ${MAX_LOGGER_BYTES / 1024 / 1024} MB`);
	const mapping = loggerMappingSchema.safeParse(Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === 'string')));
	if (!mapping.success) return problem(400, 'invalid_input', 'Map the columns of the file', toFieldErrors(mapping.error));
	const bytes = new Uint8Array(await file.arrayBuffer());
	if (looksBinary(bytes)) return problem(400, 'invalid_input', 'This is not a CSV text file (it looks like an image or an archive).', [{ path: 'file', message: 'Not a CSV file' }]);
	const text = new TextDecoder('utf-8', { fatal: false }).decode(bytes);
	const parsed = parseLoggerCsv(text, { time: mapping.data.timeColumn, volts: mapping.data.voltsColumn, amps: mapping.data.ampsColumn, timeUnit: mapping.data.timeUnit });
	if (!parsed.ok) return problem(400, 'invalid_input', parsed.message, [{ path: parsed.row ? `row ${parsed.row}` : 'file', message: parsed.message }]);

	const key = `teams/${access.teamId}/runs/${run.id}/logger-${Date.now()}.csv`;
	await locals.storage.put(key, bytes, 'text/csv');
	try {
		await locals.db.transaction().execute(async (trx) => {
			const old = await trx.selectFrom('stored_file').select(['id', 'object_key']).where('run_id', '=', run.id).where('kind', '=', 'logger').execute();
			await trx.deleteFrom('run_sample').where('run_id', '=', run.id).execute();
			await trx.deleteFrom('stored_file').where('run_id', '=', run.id).where('kind', '=', 'logger').execute();
			await trx.insertInto('stored_file').values({ team_id: access.teamId, run_id: run.id, kind: 'logger', object_key: key, file_name: file.name.slice(0, 200), content_type: 'text/csv', size_bytes: bytes.byteLength }).execute();
			for (let i = 0; i < parsed.samples.length; i += 1000) {
				await trx
					.insertInto('run_sample')
					.values(parsed.samples.slice(i, i + 1000).map((s, j) => ({ run_id: run.id, seq: i + j, t_s: s.tS, volts: s.volts, amps: s.amps })))
					.execute();
			}
			return old;
		}).then(async (old) => {
			for (const f of old) await locals.storage.remove(f.object_key).catch(() => undefined);
		});
	} catch (error) {
		await locals.storage.remove(key).catch(() => undefined);
		throw error;
	}
	return Response.json({ samples: parsed.samples.length, analysis: analyseRun(parsed.samples) }, { status: 201 });
};
