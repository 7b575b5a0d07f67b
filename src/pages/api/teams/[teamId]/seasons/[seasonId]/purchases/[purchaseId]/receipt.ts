import { randomUUID } from 'node:crypto';
import type { APIRoute } from 'astro';
import { parseUuid } from '@/lib/schemas/ids';
import { requireTeamRole } from '@/lib/server/access';
import { findPurchase, findSeason, removeReceipt, setReceipt } from '@/lib/server/db/seasons';
import { readPhotoUpload } from '@/lib/server/photo-upload';
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
	const upload = await readPhotoUpload(request, {
		tooLarge: 'Receipt photos are limited to 10 MB',
		attach: 'Attach a photo of the receipt',
		notAnImage: 'A receipt must be a JPEG, PNG or WebP photo',
	});
	if (!upload.ok) return upload.response;
	const { name, photo: checked } = upload.data;
	const key = `teams/${teamId}/receipts/${purchase.id}/receipt-${randomUUID()}.${checked.type.split('/')[1]}`;
	await locals.storage.put(key, checked.bytes, checked.type);
	try {
		const saved = await setReceipt(locals.db, {
			teamId,
			purchaseId: purchase.id,
			objectKey: key,
			fileName: name,
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
