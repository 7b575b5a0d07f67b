import { randomUUID } from 'node:crypto';
import type { APIRoute } from 'astro';
import { requireRun } from '@/lib/server/access';
import { findRunPhotos, insertPhotoPair } from '@/lib/server/db/files';
import { problem } from '@/lib/server/http';
import { readMultipart } from '@/lib/server/body';
import { checkPhoto, makeThumbnail, MAX_PHOTO_BYTES } from '@/lib/server/file-content';

/**
 * Adds a photo to a run: JPEG, PNG or WebP up to 10 MB by content, stored without its metadata
 * (EXIF with GPS, XMP, IPTC) beside a 320 px WebP thumbnail.
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const found = await requireRun(locals, params, 'member');
	if (!found.ok) return found.response;
	const { access, run } = found.value;
	const form = await readMultipart(
		request,
		MAX_PHOTO_BYTES + 64 * 1024,
		'Photos are limited to 10 MB',
	);
	if (!form.ok) return form.response;
	const file = form.data.get('file');
	if (!(file instanceof File))
		return problem(400, 'invalid_input', 'Attach a photo', [{ path: 'file', message: 'No file' }]);
	if (file.size > MAX_PHOTO_BYTES) return problem(413, 'too_large', 'Photos are limited to 10 MB');
	const checked = await checkPhoto(new Uint8Array(await file.arrayBuffer()));
	if (!checked.ok)
		return problem(
			400,
			'invalid_input',
			checked.message === 'Not a JPEG, PNG or WebP image'
				? 'Photos must be JPEG, PNG or WebP images'
				: checked.message,
			[{ path: 'file', message: checked.message }],
		);
	const thumb = await makeThumbnail(checked.bytes);
	const base = `teams/${access.teamId}/runs/${run.id}/photo-${randomUUID()}`;
	const ext = checked.type.split('/')[1];
	const keys = [`${base}.${ext}`, `${base}-thumb.webp`];
	const name = file.name.slice(0, 200);
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
