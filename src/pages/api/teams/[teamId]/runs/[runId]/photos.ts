import type { APIRoute } from 'astro';
import sharp from 'sharp';
import { requireRun } from '@/lib/server/runs';
import { problem } from '@/lib/server/http';

export const MAX_PHOTO_BYTES = 10 * 1024 * 1024;

/** The image type by its first bytes (never by the name or the declared type). */
export function sniffImage(bytes: Uint8Array): 'image/jpeg' | 'image/png' | 'image/webp' | null {
	const at = (i: number, ...b: number[]) => b.every((x, j) => bytes[i + j] === x);
	if (at(0, 0xff, 0xd8, 0xff)) return 'image/jpeg';
	if (at(0, 0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a)) return 'image/png';
	if (at(0, 0x52, 0x49, 0x46, 0x46) && at(8, 0x57, 0x45, 0x42, 0x50)) return 'image/webp';
	return null;
}

/** Adds a photo to a run: JPEG, PNG or WebP up to 10 MB, stored with a 320 px WebP thumbnail. */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const found = await requireRun(locals, params, 'member');
	if (!found.ok) return found.response;
	const { access, run } = found;
	if (!(request.headers.get('content-type') ?? '').startsWith('multipart/form-data')) return problem(415, 'unsupported_media_type', 'Send the photo as multipart/form-data');
	if (Number(request.headers.get('content-length') ?? 0) > MAX_PHOTO_BYTES + 64 * 1024) return problem(413, 'invalid_input', 'Photos are limited to 10 MB');
	const file = (await request.formData().catch(() => null))?.get('file');
	if (!(file instanceof File)) return problem(400, 'invalid_input', 'Attach a photo', [{ path: 'file', message: 'No file' }]);
	if (file.size > MAX_PHOTO_BYTES) return problem(413, 'invalid_input', 'Photos are limited to 10 MB');
	const bytes = new Uint8Array(await file.arrayBuffer());
	const type = sniffImage(bytes);
	if (!type) return problem(400, 'invalid_input', 'Photos must be JPEG, PNG or WebP images', [{ path: 'file', message: 'Not a JPEG, PNG or WebP image' }]);
	let thumb: Buffer;
	try {
		thumb = await sharp(bytes).rotate().resize(320, 320, { fit: 'inside', withoutEnlargement: true }).webp({ quality: 80 }).toBuffer();
	} catch {
		return problem(400, 'invalid_input', 'The image could not be read; it may be damaged', [{ path: 'file', message: 'Unreadable image' }]);
	}
	const base = `teams/${access.teamId}/runs/${run.id}/photo-${Date.now()}`;
	const ext = type.split('/')[1];
	await locals.storage.put(`${base}.${ext}`, bytes, type);
	await locals.storage.put(`${base}-thumb.webp`, new Uint8Array(thumb), 'image/webp');
	const ids = await locals.db.transaction().execute(async (trx) => {
		const photo = await trx.insertInto('stored_file').values({ team_id: access.teamId, run_id: run.id, kind: 'photo', object_key: `${base}.${ext}`, file_name: file.name.slice(0, 200), content_type: type, size_bytes: bytes.byteLength }).returning('id').executeTakeFirstOrThrow();
		const t = await trx.insertInto('stored_file').values({ team_id: access.teamId, run_id: run.id, kind: 'thumbnail', object_key: `${base}-thumb.webp`, file_name: `${file.name.slice(0, 190)} (thumbnail)`, content_type: 'image/webp', size_bytes: thumb.byteLength }).returning('id').executeTakeFirstOrThrow();
		return { photoId: photo.id, thumbnailId: t.id };
	});
	return Response.json(ids, { status: 201 });
};

/** The run's photos (with their thumbnails). */
export const GET: APIRoute = async ({ params, locals }) => {
	const found = await requireRun(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const { run } = found;
	const files = await locals.db.selectFrom('stored_file').select(['id', 'kind', 'object_key', 'file_name']).where('run_id', '=', run.id).where('kind', 'in', ['photo', 'thumbnail']).orderBy('created_at').execute();
	const photos = files.filter((f) => f.kind === 'photo').map((p) => ({ id: p.id, name: p.file_name, thumbnailId: files.find((f) => f.kind === 'thumbnail' && f.object_key === p.object_key.replace(/\.\w+$/, '-thumb.webp'))?.id ?? null }));
	return Response.json(photos);
};
