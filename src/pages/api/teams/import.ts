import type { APIRoute } from 'astro';
import { z } from 'zod';
import { teamNameSchema } from '@/lib/schemas/account';
import { problem, toFieldErrors } from '@/lib/server/http';
import { importTeam, parseBackup } from '@/lib/server/team-backup';

export const MAX_BACKUP_BYTES = 200 * 1024 * 1024;
const formSchema = z.object({ name: teamNameSchema.optional().or(z.literal('').transform(() => undefined)) });

/**
 * Restores a team backup as a new team (multipart: `file`, optional `name`); the importer becomes
 * its captain. A damaged, edited or newer-version file is refused before anything is written.
 */
export const POST: APIRoute = async ({ request, locals }) => {
	if (!locals.user) return problem(401, 'unauthenticated', 'Sign in first');
	if (!(request.headers.get('content-type') ?? '').startsWith('multipart/form-data')) return problem(415, 'unsupported_media_type', 'Send the backup as multipart/form-data');
	if (Number(request.headers.get('content-length') ?? 0) > MAX_BACKUP_BYTES + 64 * 1024) return problem(413, 'invalid_input', 'Backups are limited to 200 MB');
	const form = await request.formData().catch(() => null);
	const file = form?.get('file');
	if (!form || !(file instanceof File)) return problem(400, 'invalid_input', 'Attach the backup file', [{ path: 'file', message: 'No file' }]);
	if (file.size > MAX_BACKUP_BYTES) return problem(413, 'invalid_input', 'Backups are limited to 200 MB');
	const fields = formSchema.safeParse({ name: form.get('name') ?? undefined });
	if (!fields.success) return problem(400, 'invalid_input', 'Some fields need attention', toFieldErrors(fields.error));
	const parsed = parseBackup(await file.text());
	if (!parsed.ok) return problem(parsed.code === 'unsupported_version' ? 422 : 400, parsed.code, parsed.detail, parsed.errors ?? [{ path: 'file', message: parsed.detail }]);
	try {
		const summary = await importTeam(locals.db, locals.storage, parsed.backup, locals.user, fields.data.name);
		return Response.json(summary, { status: 201 });
	} catch (e) {
		console.error('team import failed', e);
		return problem(500, 'internal', 'The import failed part-way and nothing of it was kept. Try again; if it keeps failing, the file storage or the database may be down.');
	}
};
