import type { APIRoute } from 'astro';
import { z } from '@/lib/zod';
import { teamNameSchema } from '@/lib/schemas/account';
import { readMultipart } from '@/lib/server/body';
import { problem, unavailable, validated } from '@/lib/server/http';
import { importTeam, prepareBackupFiles, readBackup } from '@/lib/server/team-backup';
import { isDatabaseUnavailable, isStorageUnavailable } from '@/lib/server/unavailable';
import { errorField, log } from '@/lib/server/log';

export const MAX_BACKUP_BYTES = 200 * 1024 * 1024;
const formSchema = z.object({
	name: teamNameSchema.optional().or(z.literal('').transform(() => undefined)),
});

/**
 * Restores a team backup as a new team (multipart: `file`, optional `name`); the importer becomes
 * its captain and its only member, everyone else in the file a pending invitation. The file is
 * untrusted: a damaged, edited, newer-version file or one holding a file that is not what it says
 * is refused before anything is written.
 */
/**
 * Reads the upload and checks it through, in its own scope: the request's bytes, the form and the
 * file's text are let go before the import writes anything (a season's file is tens of megabytes).
 */
async function readBackupUpload(
	request: Request,
): Promise<
	| { ok: false; response: Response }
	| {
			ok: true;
			name: string | undefined;
			backup: Extract<Awaited<ReturnType<typeof readBackup>>, { ok: true }>['backup'];
	  }
> {
	const read = await readMultipart(
		request,
		MAX_BACKUP_BYTES + 64 * 1024,
		'Backups are limited to 200 MB',
	);
	if (!read.ok) return read;
	const form = read.data;
	const file = form.get('file');
	if (!(file instanceof File))
		return {
			ok: false,
			response: problem(400, 'invalid_input', 'Attach the backup file', [
				{ path: 'file', message: 'No file' },
			]),
		};
	if (file.size > MAX_BACKUP_BYTES)
		return { ok: false, response: problem(413, 'too_large', 'Backups are limited to 200 MB') };
	const fields = validated(
		formSchema,
		{ name: form.get('name') ?? undefined },
		'Some fields need attention',
	);
	if (!fields.ok) return fields;
	const parsed = await readBackup(file.stream());
	if (!parsed.ok)
		return {
			ok: false,
			response: problem(
				parsed.code === 'unsupported_version' ? 422 : 400,
				parsed.code,
				parsed.detail,
				parsed.errors ?? [{ path: 'file', message: parsed.detail }],
			),
		};
	return { ok: true, name: fields.data.name, backup: parsed.backup };
}

export const POST: APIRoute = async ({ request, locals }) => {
	if (!locals.user) return problem(401, 'unauthenticated', 'Sign in first');
	const upload = await readBackupUpload(request);
	if (!upload.ok) return upload.response;
	const prepared = await prepareBackupFiles(upload.backup.team);
	if (!prepared.ok)
		return problem(
			400,
			'invalid_backup',
			'This backup holds files that are not what they claim to be. Nothing was imported.',
			prepared.errors,
		);
	try {
		const summary = await importTeam(
			locals.db,
			locals.storage,
			upload.backup,
			locals.user,
			upload.name,
			prepared,
		);
		return Response.json(summary, { status: 201 });
	} catch (e) {
		if (isDatabaseUnavailable(e)) return unavailable('database');
		if (isStorageUnavailable(e)) return unavailable('storage');
		log.error({ err: errorField(e) }, 'team import failed');
		return problem(
			500,
			'internal',
			'The import failed part-way and nothing of it was kept. Try again; if it keeps failing, the file storage or the database may be down.',
		);
	}
};
