import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { marlinBuild, pebbleBuild } from '../../db/demo/builds';
import * as shelf from '../../src/pages/api/teams/[teamId]/shelf/index';
import * as shelfItem from '../../src/pages/api/teams/[teamId]/shelf/[itemId]';
import * as shelfExport from '../../src/pages/api/teams/[teamId]/shelf/export.csv';
import * as shelfImport from '../../src/pages/api/teams/[teamId]/shelf/import';
import * as teamRoute from '../../src/pages/api/teams/[teamId]';
import type { AppUser } from '../../src/lib/server/auth';
import { parseBuildDocument } from '../../src/engine';
import { DEMO_SHELF } from '../../db/demo/shelf';
import { shelfItemSchema } from '../../src/lib/schemas/shelf';
import { SHELF_GROUP, SHELF_KINDS, type ShelfItemDto } from '../../src/lib/shelf-kinds';
import { parseMoney, minorToText } from '../../src/lib/money';
import { callEndpoint, jsonRequest } from '../helpers/container';
import { addMember, localsFor, makeTeam, makeUser } from '../helpers/fixtures';
import { shelfBank, specFrom } from '../helpers/shelf';
import { createTestDb, type TestDb } from '../helpers/test-db';

/** One demo part of every kind the shelf holds, as a shelf entry. */
function oneOfEach() {
	const parts = {
		banks: pebbleBuild.banks[0]!,
		alternators: pebbleBuild.alternators[0]!,
		amplifiers: pebbleBuild.amplifiers[0]!,
		cables: pebbleBuild.cables.find((c) => c.id === 'run')!,
		fuses: pebbleBuild.cables.find((c) => c.id === 'run')!.fuses[0]!,
		loads: pebbleBuild.loads[0]!,
		isolators: {
			kind: 'relay',
			closes: 'engine_running',
			closedResistanceOhm: 0.0004,
			forwardDropV: 0,
		},
		capacitors: {
			moduleFarads: 500,
			moduleEsrOhm: 0.0002,
			moduleRatedV: 2.7,
			moduleLeakageA: 0.002,
			inSeries: 6,
			inParallel: 1,
		},
		chargers: { targetV: 14.4, maxOutputA: 40, efficiency: 0.9, runs: 'engine_running' },
	};
	return SHELF_KINDS.map((kind, i) => ({
		kind,
		label: `Shelf ${kind} "${i}"`,
		spec: specFrom(kind, parts[kind]),
		priceMinor: i === 2 ? null : 1999 + i * 1001,
		supplier: i % 2 ? 'The corner counter' : '',
		link: i === 3 ? '=HYPERLINK("x")' : '',
		owned: i,
		notes: i === 4 ? 'Two lines\nof notes, with "quotes", and a comma' : '',
	}));
}

describe('the parts shelf', () => {
	let t: TestDb;
	let teamId: string;
	let member: AppUser;
	let viewer: AppUser;
	beforeAll(async () => {
		t = await createTestDb();
		teamId = await makeTeam(t.db, 'Shelf Team');
		member = await makeUser(t.db);
		viewer = await makeUser(t.db);
		await addMember(t.db, teamId, member, 'member');
		await addMember(t.db, teamId, viewer, 'viewer');
	});
	afterAll(async () => t?.drop());

	const call = (
		module: Parameters<typeof callEndpoint>[0],
		method: string,
		params: Record<string, string> = {},
		body?: unknown,
		who: AppUser = member,
		request?: Request,
	) =>
		callEndpoint(module, {
			locals: localsFor(t.db, who),
			params: { teamId, ...params },
			request: request ?? jsonRequest('/x', method, body),
		});
	const csvRequest = (text: string) =>
		new Request('http://localhost/x', {
			method: 'POST',
			headers: { 'content-type': 'text/csv' },
			body: text,
		});

	it('keeps an entry of every kind, and each placed in a build passes the engine’s own check', async () => {
		for (const entry of oneOfEach()) {
			const res = await call(shelf, 'POST', {}, entry);
			expect(res.status, entry.kind).toBe(201);
		}
		const list = (await (await call(shelf, 'GET', {}, undefined, viewer)).json()) as ShelfItemDto[];
		expect(list.map((x) => x.kind).sort()).toEqual([...SHELF_KINDS].sort());
		// Placing a bank entry where the demo's bank is gives a build the engine's schema accepts.
		const bank = list.find((x) => x.kind === 'banks')!;
		const placed = structuredClone(marlinBuild);
		placed.banks[0] = { ...placed.banks[0]!, ...bank.spec };
		expect(parseBuildDocument(placed).ok).toBe(true);
		for (const x of list) expect(SHELF_GROUP[x.kind] === null).toBe(x.kind === 'fuses');
	});

	it('refuses a field the kind does not have, a part’s place, a fraction of a cent, and a wrong kind, naming each', async () => {
		const cases: Array<[unknown, string]> = [
			[shelfBank({ spec: { ...shelfBank().spec, wattage: 5 } }), 'spec'],
			[shelfBank({ spec: { ...shelfBank().spec, positive: 'front_pos' } }), 'spec'],
			[shelfBank({ priceMinor: 12.5 }), 'priceMinor'],
			[shelfBank({ kind: 'nodes' }), 'kind'],
			[shelfBank({ spec: { ...shelfBank().spec, unitCapacityAh: -3 } }), 'spec.unitCapacityAh'],
			[shelfBank({ label: 'Bank\u0000' }), 'label'],
		];
		for (const [body, path] of cases) {
			const res = await call(shelf, 'POST', {}, body);
			expect(res.status).toBe(400);
			const problem = (await res.json()) as { errors: Array<{ path: string }> };
			expect(
				problem.errors.some((e) => e.path.startsWith(path)),
				JSON.stringify(problem),
			).toBe(true);
		}
		expect((await call(shelf, 'POST', {}, shelfBank(), viewer)).status).toBe(403);
	});

	it('replaces an entry read at its current time, and answers 409 with the saved one to a stale save', async () => {
		const created = (await (await call(shelf, 'POST', {}, shelfBank())).json()) as ShelfItemDto;
		const first = await call(
			shelfItem,
			'PUT',
			{ itemId: created.id },
			{
				item: shelfBank({ label: 'Renamed bank', priceMinor: 50_000 }),
				updatedAt: created.updatedAt,
			},
		);
		expect(first.status).toBe(200);
		const saved = (await first.json()) as ShelfItemDto;
		expect(saved.label).toBe('Renamed bank');
		const stale = await call(
			shelfItem,
			'PUT',
			{ itemId: created.id },
			{
				item: shelfBank({ label: 'Lost edit' }),
				updatedAt: created.updatedAt,
			},
		);
		expect(stale.status).toBe(409);
		expect(((await stale.json()) as { current: ShelfItemDto }).current.label).toBe('Renamed bank');
		expect((await call(shelfItem, 'DELETE', { itemId: created.id })).status).toBe(204);
		expect((await call(shelfItem, 'DELETE', { itemId: created.id })).status).toBe(404);
	});

	it('exports every entry as CSV and imports that file back to the same entries, prices exact to the cent', async () => {
		const before = (await (await call(shelf, 'GET')).json()) as ShelfItemDto[];
		const csv = await (await call(shelfExport, 'GET')).text();
		// A cell a spreadsheet would run as a formula goes out quoted by an apostrophe.
		expect(csv).toContain(`'=HYPERLINK`);
		const other = await makeTeam(t.db, 'Shelf copy');
		await addMember(t.db, other, member, 'member');
		const res = await callEndpoint(shelfImport, {
			locals: localsFor(t.db, member),
			params: { teamId: other },
			request: csvRequest(csv),
		});
		expect(res.status, await res.clone().text()).toBe(201);
		const after = (await (
			await callEndpoint(shelf, {
				locals: localsFor(t.db, member),
				params: { teamId: other },
				request: jsonRequest('/x', 'GET'),
			})
		).json()) as ShelfItemDto[];
		const strip = (xs: ShelfItemDto[]) =>
			xs
				.map(({ id: _id, updatedAt: _u, ...rest }) => rest)
				.sort((a, b) => a.label.localeCompare(b.label));
		expect(strip(after)).toEqual(strip(before));
	});

	it('refuses a change of currency once the team has a priced entry, and allows it before', async () => {
		const captain = await makeUser(t.db);
		const fresh = await makeTeam(t.db, 'Currency Team');
		await addMember(t.db, fresh, captain, 'captain');
		const patch = (currency: string) =>
			callEndpoint(teamRoute, {
				locals: localsFor(t.db, captain),
				params: { teamId: fresh },
				request: jsonRequest('/x', 'PATCH', { currency }),
			});
		expect((await patch('EUR')).status).toBe(204);
		await callEndpoint(shelf, {
			locals: localsFor(t.db, captain),
			params: { teamId: fresh },
			request: jsonRequest('/x', 'POST', shelfBank()),
		});
		const refused = await patch('GBP');
		expect(refused.status).toBe(409);
		expect(((await refused.json()) as { errors: Array<{ path: string }> }).errors[0]!.path).toBe(
			'currency',
		);
		// Naming the same currency again is no change.
		expect((await patch('EUR')).status).toBe(204);
	});

	it('refuses a file with rows in error, naming each row and column, and adds nothing', async () => {
		const count = async () => ((await (await call(shelf, 'GET')).json()) as unknown[]).length;
		const n = await count();
		const csv = Papa.unparse([
			{ kind: 'loads', name: 'Cooling fan', price: '12.50', currentA: '3', 'size.awg': '' },
			{ kind: 'loads', name: 'Pump', price: '12.505', currentA: '2', 'size.awg': '' },
			{ kind: 'cables', name: '4 AWG red', price: '3.10', currentA: '', 'size.awg': '3/0' },
			{ kind: 'widgets', name: 'Mystery', price: '', currentA: '', 'size.awg': '' },
			{ kind: 'loads', name: 'Lights', price: '', currentA: '', 'size.awg': '4' },
		]);
		const res = await call(shelfImport, 'POST', {}, undefined, member, csvRequest(csv));
		expect(res.status).toBe(400);
		const { errors } = (await res.json()) as { errors: Array<{ path: string; message: string }> };
		const paths = errors.map((e) => e.path);
		expect(paths).toContain('rows.3.price');
		expect(paths).toContain('rows.4.size.kind');
		expect(paths).toContain('rows.5.kind');
		expect(paths).toContain('rows.6.size.awg');
		expect(errors.find((e) => e.path === 'rows.3.price')!.message).toMatch(/^Row 3: price/);
		expect(paths.some((p) => p.startsWith('rows.2'))).toBe(false);
		expect(await count()).toBe(n);
		// A column that would reach an object's prototype is refused, and reaches nothing.
		const sly = [
			'kind,name,material,insulationC,size.kind,size.awg,size.__proto__.polluted',
			'cables,Red,copper,105,awg,4,yes',
		].join('\n');
		const slyRes = await call(shelfImport, 'POST', {}, undefined, member, csvRequest(sly));
		expect(slyRes.status).toBe(400);
		expect(({} as Record<string, unknown>).polluted).toBeUndefined();
		expect(await count()).toBe(n);
		const notCsv = await call(shelfImport, 'POST', {}, { a: 1 });
		expect(notCsv.status).toBe(415);
	});
});

describe('the demo shelf', () => {
	it('holds only entries the shelf’s own check accepts', () => {
		for (const x of DEMO_SHELF) {
			const r = shelfItemSchema.safeParse({ ...x, link: '' });
			expect(r.success, `${x.label}: ${JSON.stringify(r.error?.issues)}`).toBe(true);
		}
	});
});

describe('money as whole cents', () => {
	// Exactness of decimal text to integer cents: arithmetic, no published source needed beyond
	// the definition of a cent (1/100 of the unit).
	it('reads typed prices exactly and writes them back the same', () => {
		expect(parseMoney('129.95')).toBe(12_995);
		expect(parseMoney('0.1')).toBe(10);
		expect(parseMoney('0,07')).toBe(7);
		expect(parseMoney('130')).toBe(13_000);
		expect(parseMoney('999999999.99')).toBe(99_999_999_999);
		for (const bad of ['', '-1', '1.005', '1e3', '1,000.00', '12 €', 'abc'])
			expect(parseMoney(bad), bad).toBeNull();
		for (const minor of [0, 7, 10, 12_995, 99_999_999_999])
			expect(parseMoney(minorToText(minor))).toBe(minor);
		// 0.1 + 0.2 in binary fractions is not 0.3; in cents it is.
		expect(parseMoney('0.1')! + parseMoney('0.2')!).toBe(parseMoney('0.3'));
	});
});
