import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as receipt from '../../src/pages/api/teams/[teamId]/seasons/[seasonId]/purchases/[purchaseId]/receipt';
import * as purchaseRoute from '../../src/pages/api/teams/[teamId]/seasons/[seasonId]/purchases/[purchaseId]';
import * as seasonRoute from '../../src/pages/api/teams/[teamId]/seasons/[seasonId]/index';
import * as fileRoute from '../../src/pages/api/teams/[teamId]/files/[fileId]';
import type { AppUser } from '../../src/lib/server/auth';
import { insertPurchase, insertSeason } from '../../src/lib/server/db/seasons';
import type { SeasonDetail } from '../../src/lib/schemas/seasons';
import { callEndpoint, jsonRequest } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser, memoryStorage } from '../helpers/fixtures';
import { createTestDb, type TestDb } from '../helpers/test-db';

/** A purchase's receipt photo: checked by content, stored without metadata, gone with the purchase. */
describe('receipt photos on purchases', () => {
	let t: TestDb;
	const storage = memoryStorage();
	let teamId: string;
	let seasonId: string;
	let member: AppUser;
	let viewer: AppUser;
	beforeAll(async () => {
		t = await createTestDb();
		teamId = await makeTeam(t.db, 'Receipt Team');
		member = await makeUser(t.db, undefined, 'Buyer');
		viewer = await makeUser(t.db, undefined, 'Sponsor');
		await addMember(t.db, teamId, member, 'member');
		await addMember(t.db, teamId, viewer, 'viewer');
		seasonId = await insertSeason(t.db, teamId, {
			name: 'Receipts',
			startsOn: '2027-01-01',
			endsOn: '2027-12-31',
			budgetMinor: 100_000,
		});
	});
	afterAll(async () => t?.drop());

	const newPurchase = () =>
		insertPurchase(t.db, seasonId, {
			boughtOn: '2027-02-01',
			shelfItemId: null,
			item: 'Fuse holder',
			quantity: 1,
			unitPriceMinor: 2_990,
			paidBy: member.id,
			paidByName: 'Buyer',
			notes: '',
			createdBy: member.id,
		});
	const send = (purchaseId: string, bytes: Uint8Array, name: string, who = member) => {
		const form = new FormData();
		form.set('file', new Blob([Buffer.from(bytes)]), name);
		return callEndpoint(receipt, {
			locals: localsFor(t.db, who, undefined, storage),
			params: { teamId, seasonId, purchaseId },
			request: new Request('http://localhost/x', { method: 'POST', body: form }),
		});
	};
	const call = (
		module: Parameters<typeof callEndpoint>[0],
		method: string,
		params: Record<string, string>,
	) =>
		callEndpoint(module, {
			locals: localsFor(t.db, member, undefined, storage),
			params: { teamId, seasonId, ...params },
			request: jsonRequest('/x', method),
		});
	const detail = async () => (await (await call(seasonRoute, 'GET', {})).json()) as SeasonDetail;
	const phonePhoto = () =>
		sharp({ create: { width: 60, height: 90, channels: 3, background: '#eeeeee' } })
			.jpeg()
			.withExif({
				IFD0: { Make: 'PhoneMaker', Model: 'Model X1' },
				IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 28/1 0/1' },
			})
			.toBuffer();

	it('stores a phone photo of a receipt without its EXIF and GPS, and serves it as that image', async () => {
		const purchaseId = await newPurchase();
		const res = await send(purchaseId, new Uint8Array(await phonePhoto()), 'IMG_2231.jpg');
		expect(res.status).toBe(201);
		const body = (await res.json()) as { fileId: string; metadataRemoved: boolean };
		expect(body.metadataRemoved).toBe(true);
		const p = (await detail()).purchases.find((x) => x.id === purchaseId)!;
		expect(p.receiptFileId).toBe(body.fileId);
		const served = await callEndpoint(fileRoute, {
			locals: localsFor(t.db, viewer, undefined, storage),
			params: { teamId, fileId: body.fileId },
			request: jsonRequest('/x', 'GET'),
		});
		expect(served.headers.get('content-type')).toBe('image/jpeg');
		const bytes = Buffer.from(await served.arrayBuffer());
		const meta = await sharp(bytes).metadata();
		expect(meta.exif).toBeUndefined();
		expect(bytes.includes('PhoneMaker')).toBe(false);
	});

	it('refuses what is not a photo by its bytes, whatever its name, and viewers', async () => {
		const purchaseId = await newPurchase();
		const svg = new TextEncoder().encode(
			'<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>',
		);
		const res = await send(purchaseId, svg, 'receipt.jpg');
		expect(res.status).toBe(400);
		expect((await res.json()).detail).toBe('A receipt must be a JPEG, PNG or WebP photo');
		expect(
			(await send(purchaseId, new Uint8Array(await phonePhoto()), 'r.jpg', viewer)).status,
		).toBe(403);
		expect((await detail()).purchases.find((x) => x.id === purchaseId)!.receiptFileId).toBeNull();
	});

	it('a new receipt replaces the old one, whose bytes go; deleting the purchase takes its receipt', async () => {
		const purchaseId = await newPurchase();
		await send(purchaseId, new Uint8Array(await phonePhoto()), 'first.jpg');
		const keys = () =>
			[...storage.objects.keys()].filter((k) => k.includes(`/receipts/${purchaseId}/`));
		const [first] = keys();
		const png = await sharp({ create: { width: 4, height: 4, channels: 3, background: '#000' } })
			.png()
			.toBuffer();
		expect((await send(purchaseId, new Uint8Array(png), 'second.png')).status).toBe(201);
		expect(keys()).toHaveLength(1);
		expect(keys()[0]).not.toBe(first);
		expect((await call(purchaseRoute, 'DELETE', { purchaseId })).status).toBe(204);
		expect(keys()).toEqual([]);
		const rows = await t.db
			.selectFrom('stored_file')
			.select('id')
			.where('purchase_id', '=', purchaseId)
			.execute();
		expect(rows).toEqual([]);
	});

	it('removing a receipt keeps the purchase; a purchase without one answers 404', async () => {
		const purchaseId = await newPurchase();
		await send(purchaseId, new Uint8Array(await phonePhoto()), 'r.jpg');
		expect((await call(receipt, 'DELETE', { purchaseId })).status).toBe(204);
		expect((await call(receipt, 'DELETE', { purchaseId })).status).toBe(404);
		expect((await detail()).purchases.some((x) => x.id === purchaseId)).toBe(true);
	});
});
