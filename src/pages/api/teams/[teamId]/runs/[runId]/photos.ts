import { randomUUID } from 'node:crypto';
import type { APIRoute } from 'astro';
import { requireRun } from '@/lib/server/access';
import { findRunPhotos, insertPhotoPair } from '@/lib/server/db/files';
import { makeThumbnail } from '@/lib/server/file-content';
import { readPhotoUpload } from '@/lib/server/photo-upload';

/**
 * Adds a photo to a run: JPEG, PNG or WebP up to 10 MB by content, stored without its metadata
 * (EXIF with GPS, XMP, IPTC) beside a 320 px WebP thumbnail.
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const found = await requireRun(locals, params, 'member');
	if (!found.ok) return found.response;
	const { access, run } = found.value;
	const upload = await readPhotoUpload(request, {
		tooLarge: 'Photos are limited to 10 MB',
		attach: 'Attach a photo',
		notAnImage: 'Photos must be JPEG, PNG or WebP images',
	});
	if (!upload.ok) return upload.response;
	const { name, photo: checked } = upload.data;
	const thumb = await makeThumbnail(checked.bytes);
	const base = `teams/${access.teamId}/runs/${run.id}/photo-${randomUUID()}`;
	const ext = checked.type.split('/')[1];
	const keys = [`${base}.${ext}`, `${base}-thumb.webp`];
	try {
		await locals.storage.put(keys[0]!, checked.bytes, checked.type);
		await locals.storage.put(keys[1]!, thumb, 'image/webp');
		const ids = await insertPhotoPair(locals.db, {
			teamId: access.teamId,
			runId: run.id,
			fileName: name,
			photo: {
				objectKey: keys[0]!,
				contentType: checked.type,
				sizeBytes: checked.bytes.byteLength,
			},
			thumbnail: { objectKey: keys[1]!, sizeBytes: thumb.byteLength },
		});
		return Response.json({ ...ids, metadataRemoved: checked.stripped }, { status: 201 });
	} catch (error) {
		await Promise.all(keys.map((k) => locals.storage.remove(k).catch(() => undefined)));
		throw error;
	}
};

/** The run's photos (with their thumbnails). */
export const GET: APIRoute = async ({ params, locals }) => {
	const found = await requireRun(locals, params, 'viewer');
	if (!found.ok) return found.response;
	const { run } = found.value;
	const photos = await findRunPhotos(locals.db, run.id);
	return Response.json(photos);
};
