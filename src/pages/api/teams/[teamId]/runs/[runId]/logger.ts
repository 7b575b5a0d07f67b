import type { APIRoute } from 'astro';
import { analyseRun } from '@/engine/run-analysis';
import { loggerMappingSchema } from '@/lib/schemas/events';
import { MAX_LOGGER_BYTES, parseLoggerCsv } from '@/lib/logger-csv';
import { requireRun } from '@/lib/server/runs';
import { problem, validated } from '@/lib/server/http';
import { readMultipart } from '@/lib/server/body';
import { checkLoggerFile } from '@/lib/server/file-content';
import { randomUUID } from 'node:crypto';

/**
 * Uploads a logger file (multipart: `file` plus the column mapping). The file is checked by its
 * content, parsed, stored in S3 and its samples written to PostgreSQL in one transaction; a file
 * that fails any check stores nothing and says which row and why.
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const found = await requireRun(locals, params, 'member');
	if (!found.ok) return found.response;
	const { access, run } = found;
	const read = await readMultipart(request, MAX_LOGGER_BYTES + 64 * 1024, `Logger files are limited to ${MAX_LOGGER_BYTES / 1024 / 1024} MB`);
	if (!read.ok) return read.response;
	const form = read.data;
	const file = form.get('file');
	if (!(file instanceof File)) return problem(400, 'invalid_input', 'Attach the logger file', [{ path: 'file', message: 'No file' }]);
	if (file.size > MAX_LOGGER_BYTES) return problem(413, 'too_large', `Logger files are limited to ${MAX_LOGGER_BYTES / 1024 / 1024} MB`);
	const mapping = validated(loggerMappingSchema, Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === 'string')), 'Map the columns of the file');
	if (!mapping.ok) return mapping.response;
	const bytes = new Uint8Array(await file.arrayBuffer());
	const checked = checkLoggerFile(bytes);
	if (!checked.ok) return problem(400, 'invalid_input', checked.message, [{ path: 'file', message: 'Not a CSV file' }]);
	const text = checked.text;
	const parsed = parseLoggerCsv(text, { time: mapping.data.timeColumn, volts: mapping.data.voltsColumn, amps: mapping.data.ampsColumn, timeUnit: mapping.data.timeUnit });
	if (!parsed.ok) return problem(400, 'invalid_input', parsed.message, [{ path: parsed.row ? `row ${parsed.row}` : 'file', message: parsed.message }]);

	const key = `teams/${access.teamId}/runs/${run.id}/logger-${randomUUID()}.csv`;
	await locals.storage.put(key, bytes, 'text/csv');
	try {
		const outcome = await locals.db.transaction().execute(async (trx) => {
			// One upload per run at a time: a second one waits for none and is told to retry.
			const locked = await trx.selectFrom('run').select('id').where('id', '=', run.id).forUpdate().skipLocked().executeTakeFirst();
			if (!locked) return 'busy' as const;
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
		});
		if (outcome === 'busy') {
			await locals.storage.remove(key).catch(() => undefined);
			return problem(409, 'conflict', 'Another logger file is being uploaded to this run right now. Wait for it to finish, then try again.');
		}
		for (const f of outcome) await locals.storage.remove(f.object_key).catch(() => undefined);
	} catch (error) {
		await locals.storage.remove(key).catch(() => undefined);
		throw error;
	}
	return Response.json({ samples: parsed.samples.length, analysis: analyseRun(parsed.samples) }, { status: 201 });
};
