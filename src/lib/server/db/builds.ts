import { type Kysely, sql } from 'kysely';
import type { Database, RevisionRow } from '@/lib/server/db/schema';
import type { BuildDocument } from '@/engine';
import type { RevisionDto, RevisionSummary } from '@/lib/schemas/vehicles';

type Db = Kysely<Database>;

export function findBuildForVehicle(db: Db, vehicleId: string) {
	return db.selectFrom('build').selectAll().where('vehicle_id', '=', vehicleId).executeTakeFirst();
}

const summaryColumns = [
	'r.id',
	'r.number',
	'r.parent_id',
	'r.message',
	'r.created_at',
	'r.schema_version',
	'u.name as author_name',
	'r.imported_by',
	'src.number as restored_number',
] as const;

/** A live account's name, or the name a restored backup recorded (never mistaken for a live account). */
export const shownAuthor = (name: string | null, importedBy: string | null): string | null =>
	name ?? (importedBy ? `imported: ${importedBy}` : null);

function baseRevisionQuery(db: Db) {
	return db
		.selectFrom('revision as r')
		.leftJoin('User as u', 'u.id', 'r.author_id')
		.leftJoin('revision as src', 'src.id', 'r.restored_from_id');
}

function toSummary(r: {
	id: string;
	number: number;
	parent_id: string | null;
	message: string;
	created_at: Date;
	author_name: string | null;
	imported_by: string | null;
	restored_number: number | null;
}): RevisionSummary {
	return {
		id: r.id,
		number: r.number,
		parentId: r.parent_id,
		message: r.message,
		authorName: shownAuthor(r.author_name, r.imported_by),
		createdAt: r.created_at.toISOString(),
		restoredFromNumber: r.restored_number,
	};
}

function toRevisionDto(
	r: Parameters<typeof toSummary>[0] & { schema_version: number; document: unknown },
): RevisionDto {
	return {
		...toSummary(r),
		schemaVersion: r.schema_version,
		document: r.document as BuildDocument,
	};
}

export async function listRevisions(db: Db, buildId: string): Promise<RevisionSummary[]> {
	const rows = await baseRevisionQuery(db)
		.select(summaryColumns)
		.where('r.build_id', '=', buildId)
		.orderBy('r.number', 'desc')
		.execute();
	return rows.map(toSummary);
}

/**
 * A vehicle's revisions, newest first, and its head with the document, in one query: what the
 * build page shows. It is started beside the page's access check.
 */
export async function findRevisionsAndHeadOfVehicle(
	db: Db,
	vehicleId: string,
): Promise<{ head: RevisionDto | undefined; revisions: RevisionSummary[] }> {
	const rows = await baseRevisionQuery(db)
		.innerJoin('build as b', 'b.id', 'r.build_id')
		.select([
			...summaryColumns,
			'r.schema_version',
			sql<unknown>`case when r.id = b.head_revision_id then r.document end`.as('document'),
			sql<boolean>`r.id = b.head_revision_id`.as('is_head'),
		])
		.where('b.vehicle_id', '=', vehicleId)
		.orderBy('r.number', 'desc')
		.execute();
	const head = rows.find((r) => r.is_head);
	return { head: head && toRevisionDto(head), revisions: rows.map(toSummary) };
}

export async function findRevision(
	db: Db,
	buildId: string,
	revisionId: string,
): Promise<RevisionDto | undefined> {
	const r = await baseRevisionQuery(db)
		.select([...summaryColumns, 'r.document'])
		.where('r.build_id', '=', buildId)
		.where('r.id', '=', revisionId)
		.executeTakeFirst();
	return r && toRevisionDto(r);
}

/** The build's head revision with its document, in one query (none before the first save). */
export const findHeadRevision = (db: Db, buildId: string) => headRevisionBy(db, 'hb.id', buildId);

/** The head revision of the build found by `column` (its id, or its vehicle's). */
async function headRevisionBy(
	db: Db,
	column: 'hb.id' | 'hb.vehicle_id',
	value: string,
): Promise<RevisionDto | undefined> {
	const r = await baseRevisionQuery(db)
		.innerJoin('build as hb', 'hb.head_revision_id', 'r.id')
		.select([...summaryColumns, 'r.document'])
		.where(column, '=', value)
		.executeTakeFirst();
	return r && toRevisionDto(r);
}

/** The head revision's id and number (none before the first save), without its document. */
export async function findHeadNumber(
	db: Db,
	buildId: string,
): Promise<{ id: string; number: number } | undefined> {
	return db
		.selectFrom('build as b')
		.innerJoin('revision as r', 'r.id', 'b.head_revision_id')
		.select(['r.id', 'r.number'])
		.where('b.id', '=', buildId)
		.executeTakeFirst();
}

/** A revision's document as JSON text, as stored (not parsed here), when the build holds it. */
export async function findRevisionDocumentText(
	db: Db,
	buildId: string,
	revisionId: string,
): Promise<string | undefined> {
	const row = await db
		.selectFrom('revision')
		.select(sql<string>`document::text`.as('text'))
		.where('build_id', '=', buildId)
		.where('id', '=', revisionId)
		.executeTakeFirst();
	return row?.text;
}

export type SaveResult =
	{ ok: true; revision: RevisionRow } | { ok: false; reason: 'stale'; headId: string | null };

/**
 * Appends a revision to a build's chain in one transaction. The build row is locked, and the save
 * only goes through when `parentId` is still the head: a concurrent save by someone else makes
 * this one stale (the caller answers 409 with both versions), so nothing is overwritten.
 */
export async function appendRevision(
	db: Db,
	p: {
		buildId: string;
		parentId: string | null;
		document: BuildDocument;
		message: string;
		authorId: string;
		restoredFromId?: string | null;
	},
	/** Further writes that belong with the new revision (same transaction). */
	after?: (trx: Db, revision: RevisionRow) => Promise<void>,
): Promise<SaveResult> {
	return db.transaction().execute(async (trx): Promise<SaveResult> => {
		const build = await trx
			.selectFrom('build')
			.select(['id', 'head_revision_id'])
			.where('id', '=', p.buildId)
			.forUpdate()
			.executeTakeFirstOrThrow();
		if (build.head_revision_id !== p.parentId)
			return { ok: false, reason: 'stale', headId: build.head_revision_id };
		const last = await trx
			.selectFrom('revision')
			.select((eb) => eb.fn.max('number').as('n'))
			.where('build_id', '=', p.buildId)
			.executeTakeFirst();
		const revision = await trx
			.insertInto('revision')
			.values({
				build_id: p.buildId,
				parent_id: p.parentId,
				number: Number(last?.n ?? 0) + 1,
				schema_version: p.document.schemaVersion,
				document: JSON.stringify(p.document),
				message: p.message,
				author_id: p.authorId,
				restored_from_id: p.restoredFromId ?? null,
			})
			.returningAll()
			.executeTakeFirstOrThrow();
		await trx
			.updateTable('build')
			.set({ head_revision_id: revision.id })
			.where('id', '=', p.buildId)
			.execute();
		if (after) await after(trx, revision);
		return { ok: true, revision };
	});
}

/**
 * The revision of a vehicle's build in force at a moment: the newest one saved at or before it,
 * compared to the whole second (a run's time is kept to the second, so a run logged in the same
 * second as a save, even a fraction before it, counts as made on the new revision).
 */
export async function revisionInForce(db: Db, vehicleId: string, at: Date): Promise<string | null> {
	const row = await db
		.selectFrom('revision as r')
		.innerJoin('build as b', 'b.id', 'r.build_id')
		.select('r.id')
		.where('b.vehicle_id', '=', vehicleId)
		.where(
			sql<Date>`date_trunc('second', r.created_at)`,
			'<=',
			sql<Date>`date_trunc('second', ${at.toISOString()}::timestamptz)`,
		)
		.orderBy('r.created_at', 'desc')
		.orderBy('r.number', 'desc')
		.limit(1)
		.executeTakeFirst();
	return row?.id ?? null;
}

/**
 * For each vehicle of the team, the revision in force at `at` (as `revisionInForce`), in one
 * query: vehicle id → revision id. Vehicles with no revision by then are absent.
 */
export async function revisionsInForce(
	db: Db,
	teamId: string,
	at: Date,
): Promise<Map<string, string>> {
	const rows = await db
		.selectFrom('revision as r')
		.innerJoin('build as b', 'b.id', 'r.build_id')
		.innerJoin('vehicle as v', 'v.id', 'b.vehicle_id')
		.distinctOn('b.vehicle_id')
		.select(['b.vehicle_id', 'r.id'])
		.where('v.team_id', '=', teamId)
		.where(
			sql<Date>`date_trunc('second', r.created_at)`,
			'<=',
			sql<Date>`date_trunc('second', ${at.toISOString()}::timestamptz)`,
		)
		.orderBy('b.vehicle_id')
		.orderBy('r.created_at', 'desc')
		.orderBy('r.number', 'desc')
		.execute();
	return new Map(rows.map((r) => [r.vehicle_id, r.id]));
}

/** The documents of the given revisions (any build), by revision id. */
export async function findRevisionDocuments(
	db: Db,
	revisionIds: string[],
): Promise<Map<string, BuildDocument>> {
	if (revisionIds.length === 0) return new Map();
	const rows = await db
		.selectFrom('revision')
		.select(['id', 'document'])
		.where('id', 'in', revisionIds)
		.execute();
	return new Map(rows.map((r) => [r.id, r.document as BuildDocument]));
}

export async function revisionBelongsTo(
	db: Db,
	vehicleId: string,
	revisionId: string,
): Promise<boolean> {
	const row = await db
		.selectFrom('revision as r')
		.innerJoin('build as b', 'b.id', 'r.build_id')
		.select('r.id')
		.where('b.vehicle_id', '=', vehicleId)
		.where('r.id', '=', revisionId)
		.executeTakeFirst();
	return Boolean(row);
}

/** Every revision of a build with its document, newest first, in one query (the history page). */
export async function listRevisionsWithDocuments(db: Db, buildId: string): Promise<RevisionDto[]> {
	const rows = await baseRevisionQuery(db)
		.select([...summaryColumns, 'r.document'])
		.where('r.build_id', '=', buildId)
		.orderBy('r.number', 'desc')
		.execute();
	return rows.map((r) => ({
		...toSummary(r),
		schemaVersion: r.schema_version,
		document: r.document as BuildDocument,
	}));
}
