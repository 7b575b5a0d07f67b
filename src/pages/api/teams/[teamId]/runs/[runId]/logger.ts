import type { APIRoute } from 'astro';
import { EngineBusy, runEngine } from '@/lib/server/engine/pool';
import { loggerMappingSchema } from '@/lib/schemas/runs';
import { MAX_LOGGER_BYTES, parseLoggerCsv } from '@/lib/logger-csv';
import { requireRun } from '@/lib/server/access';
import { replaceLoggerData } from '@/lib/server/db/runs';
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
	const { access, run } = found.value;
	const read = await readMultipart(
		request,
		MAX_LOGGER_BYTES + 64 * 1024,
		`Logger files are limited to ${MAX_LOGGER_BYTES / 1024 / 1024} MB`,
	);
	if (!read.ok) return read.response;
	const form = read.data;
	const file = form.get('file');
	if (!(file instanceof File))
		return problem(400, 'invalid_input', 'Attach the logger file', [
			{ path: 'file', message: 'No file' },
		]);
	if (file.size > MAX_LOGGER_BYTES)
		return problem(
			413,
			'too_large',
			`Logger files are limited to ${MAX_LOGGER_BYTES / 1024 / 1024} MB`,
		);
	const mapping = validated(
		loggerMappingSchema,
		Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === 'string')),
		'Map the columns of the file',
	);
	if (!mapping.ok) return mapping.response;
	const bytes = new Uint8Array(await file.arrayBuffer());
	const checked = checkLoggerFile(bytes);
	if (!checked.ok)
		return problem(400, 'invalid_input', checked.message, [
			{ path: 'file', message: 'Not a CSV file' },
		]);
	const text = checked.text;
	const parsed = parseLoggerCsv(text, {
		time: mapping.data.timeColumn,
		volts: mapping.data.voltsColumn,
		amps: mapping.data.ampsColumn,
		timeUnit: mapping.data.timeUnit,
	});
	if (!parsed.ok)
		return problem(400, 'invalid_input', parsed.message, [
			{ path: parsed.row ? `row ${parsed.row}` : 'file', message: parsed.message },
		]);

	const key = `teams/${access.teamId}/runs/${run.id}/logger-${randomUUID()}.csv`;
	await locals.storage.put(key, bytes, 'text/csv');
	try {
		const outcome = await replaceLoggerData(locals.db, {
			teamId: access.teamId,
			runId: run.id,
			objectKey: key,
			fileName: file.name.slice(0, 200),
			sizeBytes: bytes.byteLength,
			samples: parsed.samples,
		});
		if (!outcome.ok) {
			await locals.storage.remove(key).catch(() => undefined);
			return problem(
				409,
				'conflict',
				'Another logger file is being uploaded to this run right now. Wait for it to finish, then try again.',
			);
		}
		for (const old of outcome.replacedKeys) await locals.storage.remove(old).catch(() => undefined);
	} catch (error) {
		await locals.storage.remove(key).catch(() => undefined);
		throw error;
	}
	return Response.json(
		{
			samples: parsed.samples.length,
			// The samples are written: a busy engine leaves the analysis to the run's page, not the upload failed.
			analysis: await runEngine(
				'analyseRun',
				{ samples: parsed.samples },
				{ team: access.teamId },
			).catch((error: unknown) => {
				if (error instanceof EngineBusy) return null;
				throw error;
			}),
		},
		{ status: 201 },
	);
};
