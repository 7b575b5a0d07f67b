import { readMultipart } from './body';
import { type CheckedPhoto, checkPhoto, MAX_PHOTO_BYTES } from './file-content';
import { problem, type ReadResult } from './http';

/**
 * A photo sent as the `file` of a multipart form (a run's photo, a purchase's receipt): up to
 * 10 MB, JPEG, PNG or WebP by its bytes, its metadata removed. Every refusal answers a problem
 * naming `file`, in the route's own words.
 */
export async function readPhotoUpload(
	request: Request,
	words: { tooLarge: string; attach: string; notAnImage: string },
): Promise<ReadResult<{ name: string; photo: CheckedPhoto & { ok: true } }>> {
	const form = await readMultipart(request, MAX_PHOTO_BYTES + 64 * 1024, words.tooLarge);
	if (!form.ok) return form;
	const file = form.data.get('file');
	if (!(file instanceof File))
		return {
			ok: false,
			response: problem(400, 'invalid_input', words.attach, [{ path: 'file', message: 'No file' }]),
		};
	if (file.size > MAX_PHOTO_BYTES)
		return { ok: false, response: problem(413, 'too_large', words.tooLarge) };
	const checked = await checkPhoto(new Uint8Array(await file.arrayBuffer()));
	if (!checked.ok)
		return {
			ok: false,
			response: problem(
				400,
				'invalid_input',
				checked.message === 'Not a JPEG, PNG or WebP image' ? words.notAnImage : checked.message,
				[{ path: 'file', message: checked.message }],
			),
		};
	return { ok: true, data: { name: file.name.slice(0, 200), photo: checked } };
}
