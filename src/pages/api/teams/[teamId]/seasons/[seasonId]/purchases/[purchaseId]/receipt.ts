import { randomUUID } from 'node:crypto';
import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/access';
import { findPurchase, findSeason, removeReceipt, setReceipt } from '@/lib/server/db/seasons';
import { readMultipart } from '@/lib/server/body';
import { checkPhoto, MAX_PHOTO_BYTES } from '@/lib/server/file-content';
import { problem } from '@/lib/server/http';
import { removeObjects } from '@/lib/server/object-cleanup';

async function purchaseOf(params: Record<string, string | undefined>, locals: App.Locals) {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth;
	const seasonId = parseUuid(params.seasonId);
	const id = parseUuid(params.purchaseId);
	const season = seasonId ? await findSeason(locals.db, auth.value.teamId, seasonId) : null;
	const purchase = season && id ? await findPurchase(locals.db, season.id, id) : undefined;
	if (!purchase)
		return {
			ok: false as const,
			response: problem(404, 'not_found', 'No such purchase in this season'),
		};
	return { ok: true as const, value: { teamId: auth.value.teamId, purchase } };
}

/**
 * Adds (or replaces) a purchase's receipt photo: JPEG, PNG or WebP up to 10 MB by content, stored
 * without its metadata (EXIF with GPS, XMP, IPTC), as a run's photos are.
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const found = await purchaseOf(params, locals);
	if (!found.ok) return found.response;
	const { teamId, purchase } = found.value;
	const form = await readMultipart(
		request,
		MAX_PHOTO_BYTES + 64 * 1024,
		'Receipt photos are limited to 10 MB',
	);
	if (!form.ok) return form.response;
	const file = form.data.get('file');
	if (!(file instanceof File))
		return problem(400, 'invalid_input', 'Attach a photo of the receipt', [
			{ path: 'file', message: 'No file' },
		]);
	if (file.size > MAX_PHOTO_BYTES)
		return problem(413, 'too_large', 'Receipt photos are limited to 10 MB');
	const checked = await checkPhoto(new Uint8Array(await file.arrayBuffer()));
	if (!checked.ok)
		return problem(
			400,
			'invalid_input',
			checked.message === 'Not a JPEG, PNG or WebP image'
				? 'A receipt must be a JPEG, PNG or WebP photo'
				: checked.message,
			[{ path: 'file', message: checked.message }],
		);
	const key = `teams/${teamId}/receipts/${purchase.id}/receipt-${randomUUID()}.${checked.type.split('/')[1]}`;
	await locals.storage.put(key, checked.bytes, checked.type);
	try {
		const saved = await setReceipt(locals.db, {
			teamId,
			purchaseId: purchase.id,
			objectKey: key,
			fileName: file.name.slice(0, 200),
			contentType: checked.type,
			sizeBytes: checked.bytes.byteLength,
		});
		await removeObjects(locals.storage, saved.replaced);
		return Response.json(
			{ fileId: saved.fileId, metadataRemoved: checked.stripped },
			{ status: 201 },
		);
	} catch (error) {
		await removeObjects(locals.storage, [key]);
		throw error;
	}
};

/** Removes a purchase's receipt photo. */
export const DELETE: APIRoute = async ({ params, locals }) => {
	const found = await purchaseOf(params, locals);
	if (!found.ok) return found.response;
	const keys = await removeReceipt(locals.db, found.value.purchase.id);
	if (keys.length === 0) return problem(404, 'not_found', 'This purchase has no receipt');
	await removeObjects(locals.storage, keys);
	return new Response(null, { status: 204 });
};
