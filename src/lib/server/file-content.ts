import sharp from 'sharp';

/**
 * What a stored file is, decided by its bytes and never by its name or declared type: the same
 * checks for an upload and for a file restored from a backup.
 */

export type ImageType = 'image/jpeg' | 'image/png' | 'image/webp';

export const MAX_PHOTO_BYTES = 10 * 1024 * 1024;
/** Largest photo side kept; bigger images are scaled down (a phone photo is about 4,000 px). */
const MAX_PIXELS = 60_000_000;

/** The image type by its first bytes. */
export function sniffImage(bytes: Uint8Array): ImageType | null {
	const at = (i: number, ...b: number[]) => b.every((x, j) => bytes[i + j] === x);
	if (at(0, 0xff, 0xd8, 0xff)) return 'image/jpeg';
	if (at(0, 0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a)) return 'image/png';
	if (at(0, 0x52, 0x49, 0x46, 0x46) && at(8, 0x57, 0x45, 0x42, 0x50)) return 'image/webp';
	return null;
}

/** Bytes that mark binary files (images, archives, executables) which are not a logger CSV, whatever their name. */
export function looksBinary(bytes: Uint8Array): boolean {
	const head = bytes.subarray(0, 8);
	const sig = (...b: number[]) => b.every((x, i) => head[i] === x);
	if (
		sig(0xff, 0xd8, 0xff) ||
		sig(0x89, 0x50, 0x4e, 0x47) ||
		sig(0x52, 0x49, 0x46, 0x46) ||
		sig(0x50, 0x4b, 0x03, 0x04) ||
		sig(0x47, 0x49, 0x46) ||
		sig(0x7f, 0x45, 0x4c, 0x46) ||
		sig(0x25, 0x50, 0x44, 0x46)
	)
		return true;
	return bytes.subarray(0, 4096).includes(0);
}

/** Text that a browser could take for a page or a script if it ever sniffed it (a CSV never starts so). */
function looksLikeMarkup(bytes: Uint8Array): boolean {
	const head = new TextDecoder('utf-8', { fatal: false })
		.decode(bytes.subarray(0, 1024))
		.trimStart()
		.toLowerCase();
	return /^(<!doctype|<html|<script|<svg|<\?xml|<head|<body|<iframe)/.test(head);
}

export type CheckedPhoto =
	| { ok: true; type: ImageType; bytes: Uint8Array; stripped: boolean }
	| { ok: false; message: string };

/**
 * A photo as it may be stored: JPEG, PNG or WebP by content, decodable, and without metadata.
 * EXIF (with GPS position, camera serial, time), XMP, IPTC and ICC blocks are removed by encoding
 * the pixels again in the same format, turned upright first so the EXIF orientation is not needed.
 * An image that carries none of them is kept byte for byte.
 */
export async function checkPhoto(input: Uint8Array): Promise<CheckedPhoto> {
	const type = sniffImage(input);
	if (!type) return { ok: false, message: 'Not a JPEG, PNG or WebP image' };
	let meta: sharp.Metadata;
	try {
		meta = await sharp(input, { limitInputPixels: MAX_PIXELS }).metadata();
	} catch {
		return { ok: false, message: 'The image could not be read; it may be damaged' };
	}
	const formatOf: Record<string, ImageType> = {
		jpeg: 'image/jpeg',
		png: 'image/png',
		webp: 'image/webp',
	};
	if (formatOf[meta.format ?? ''] !== type)
		return { ok: false, message: 'The image content does not match its type' };
	const hasMetadata = Boolean(
		meta.exif ||
		meta.xmp ||
		meta.iptc ||
		meta.icc ||
		meta.tifftagPhotoshop ||
		(meta.orientation && meta.orientation !== 1) ||
		hasTextChunks(input, type),
	);
	if (!hasMetadata) {
		// Decode fully once: a header that parses over a broken body is still a broken image.
		try {
			await sharp(input, { limitInputPixels: MAX_PIXELS }).raw().toBuffer();
		} catch {
			return { ok: false, message: 'The image could not be read; it may be damaged' };
		}
		return { ok: true, type, bytes: input, stripped: false };
	}
	try {
		const pipeline = sharp(input, { limitInputPixels: MAX_PIXELS }).rotate();
		const out =
			type === 'image/jpeg'
				? pipeline.jpeg({ quality: 92, mozjpeg: false })
				: type === 'image/png'
					? pipeline.png()
					: pipeline.webp({ quality: 92 });
		return { ok: true, type, bytes: new Uint8Array(await out.toBuffer()), stripped: true };
	} catch {
		return { ok: false, message: 'The image could not be read; it may be damaged' };
	}
}

/** PNG tEXt/iTXt/zTXt/eXIf chunks carry free text and EXIF that sharp's metadata does not always list. */
function hasTextChunks(bytes: Uint8Array, type: ImageType): boolean {
	if (type !== 'image/png') return false;
	let i = 8;
	const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	while (i + 8 <= bytes.byteLength) {
		const length = view.getUint32(i);
		const name = String.fromCharCode(bytes[i + 4]!, bytes[i + 5]!, bytes[i + 6]!, bytes[i + 7]!);
		if (name === 'tEXt' || name === 'iTXt' || name === 'zTXt' || name === 'eXIf' || name === 'tIME')
			return true;
		if (name === 'IEND') break;
		i += 12 + length;
	}
	return false;
}

/** The 320 px WebP thumbnail shown in lists. */
export async function makeThumbnail(photo: Uint8Array): Promise<Uint8Array> {
	return new Uint8Array(
		await sharp(photo, { limitInputPixels: MAX_PIXELS })
			.rotate()
			.resize(320, 320, { fit: 'inside', withoutEnlargement: true })
			.webp({ quality: 80 })
			.toBuffer(),
	);
}

/** A thumbnail from a backup: a WebP image that decodes, and nothing else. */
export async function checkThumbnail(
	bytes: Uint8Array,
): Promise<{ ok: true } | { ok: false; message: string }> {
	if (sniffImage(bytes) !== 'image/webp')
		return { ok: false, message: 'A thumbnail must be a WebP image' };
	try {
		const meta = await sharp(bytes, { limitInputPixels: MAX_PIXELS }).metadata();
		if (meta.format !== 'webp' || meta.exif || meta.xmp)
			return { ok: false, message: 'A thumbnail must be a plain WebP image' };
	} catch {
		return { ok: false, message: 'The thumbnail could not be read' };
	}
	return { ok: true };
}

/** A logger file: UTF-8 text, not an image, archive, program or page. */
export function checkLoggerFile(
	bytes: Uint8Array,
): { ok: true; text: string } | { ok: false; message: string } {
	if (looksBinary(bytes))
		return {
			ok: false,
			message: 'This is not a CSV text file (it looks like an image or an archive).',
		};
	if (looksLikeMarkup(bytes))
		return {
			ok: false,
			message: 'This is not a CSV text file (it looks like a web page or markup).',
		};
	return { ok: true, text: new TextDecoder('utf-8', { fatal: false }).decode(bytes) };
}
