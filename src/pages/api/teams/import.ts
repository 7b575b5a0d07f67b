import type { APIRoute } from 'astro';
import { z } from '@/lib/zod';
import { teamNameSchema } from '@/lib/schemas/account';
import { streamMultipartFile } from '@/lib/server/body';
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
 * Reads the upload as it arrives and checks it through: the file streams into the backup reader
 * (never held whole), and what stays of it is the parsed team, runs' samples packed.
 */
async function readBackupUpload(request: Request): Promise<
	| { ok: false; response: Response }
	| {
			ok: true;
			name: string | undefined;
			backup: Extract<Awaited<ReturnType<typeof readBackup>>, { ok: true }>['backup'];
	  }
> {
	const read = await streamMultipartFile(
		request,
		{ limit: MAX_BACKUP_BYTES, tooLarge: 'Backups are limited to 200 MB' },
		(file) => readBackup(file),
	);
	if (!read.ok) return read;
	const parsed = read.data.result;
	if (!parsed)
		return {
			ok: false,
			response: problem(400, 'invalid_input', 'Attach the backup file', [
				{ path: 'file', message: 'No file' },
			]),
		};
	const fields = validated(
		formSchema,
		{ name: read.data.fields.name },
		'Some fields need attention',
	);
	if (!fields.ok) return fields;
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
