import { type Kysely, sql } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import { PART_GROUPS, type BuildDocument } from '@/engine';
import type {
	PlanDto,
	PlanPart,
	PlanPartInput,
	PlanSummary,
	UpdatePlanInput,
} from '@/lib/schemas/plans';
import { appendRevision, type SaveResult, shownAuthor } from './builds';

type Db = Kysely<Database>;

export const toMinor = (price: number) => Math.round(price * 100);
export const fromMinor = (minor: string | number) => Number(minor) / 100;

/** Total of a parts list in minor units, so sums are exact. */
export function partsTotalMinor(parts: Pick<PlanPart, 'quantity' | 'unitPrice'>[]): number {
	return parts.reduce((s, p) => s + p.quantity * toMinor(p.unitPrice), 0);
}

function planQuery(db: Db) {
	return db
		.selectFrom('plan as p')
		.leftJoin('revision as base', 'base.id', 'p.base_revision_id')
		.leftJoin('revision as inst', 'inst.id', 'p.installed_revision_id')
		.leftJoin('User as u', 'u.id', 'p.created_by')
		.select([
			'p.id',
			'p.name',
			'p.notes',
			'p.base_revision_id',
			'base.number as base_number',
			'inst.number as installed_number',
			'p.installed_at',
			'p.created_at',
			'p.updated_at',
			'p.version',
			'u.name as author_name',
			'p.imported_by',
		])
		.select((eb) => [
			eb
				.selectFrom('plan_part as pp')
				.whereRef('pp.plan_id', '=', 'p.id')
				.select((e) => e.fn.countAll<string>().as('c'))
				.as('part_count'),
			eb
				.selectFrom('plan_part as pp')
				.whereRef('pp.plan_id', '=', 'p.id')
				.select(sql<string>`coalesce(sum(pp.quantity * pp.unit_price_minor), 0)`.as('s'))
				.as('total_minor'),
		]);
}

type PlanRow = Awaited<ReturnType<ReturnType<typeof planQuery>['executeTakeFirstOrThrow']>>;

function toSummary(r: PlanRow): PlanSummary {
	return {
		id: r.id,
		name: r.name,
		notes: r.notes,
		baseRevisionId: r.base_revision_id,
		baseRevisionNumber: r.base_number,
		partCount: Number(r.part_count ?? 0),
		total: fromMinor(r.total_minor ?? 0),
		authorName: shownAuthor(r.author_name, r.imported_by),
		createdAt: r.created_at.toISOString(),
		updatedAt: r.updated_at.toISOString(),
		installedRevisionNumber: r.installed_number,
		installedAt: r.installed_at ? r.installed_at.toISOString() : null,
	};
}

export async function listPlans(db: Db, vehicleId: string): Promise<PlanSummary[]> {
	const rows = await planQuery(db)
		.where('p.vehicle_id', '=', vehicleId)
		.orderBy('p.created_at')
		.orderBy('p.id')
		.execute();
	return rows.map(toSummary);
}

export async function findPlan(
	db: Db,
	vehicleId: string,
	planId: string,
): Promise<PlanDto | undefined> {
	const row = await planQuery(db)
		.select('p.document')
		.where('p.vehicle_id', '=', vehicleId)
		.where('p.id', '=', planId)
		.executeTakeFirst();
	if (!row) return undefined;
	return {
		...toSummary(row),
		version: row.version,
		document: row.document as BuildDocument,
		parts: await findPlanParts(db, planId),
	};
}

/** A plan's parts list, in its order. */
async function findPlanParts(db: Db, planId: string): Promise<PlanPart[]> {
	const rows = await db
		.selectFrom('plan_part')
		.selectAll()
		.where('plan_id', '=', planId)
		.orderBy('position')
		.execute();
	return rows.map((p) => ({
		item: p.item,
		quantity: p.quantity,
		unitPrice: fromMinor(p.unit_price_minor),
		link: p.link,
	}));
}

/** What the plan page needs: the plan without its document, the document's part count and, when
 * it has at most `inlineParts` parts, the document as JSON text (never parsed here: the page packs
 * it as it comes). A larger one the page's island fetches once live. */
export async function findPlanForPage(
	db: Db,
	vehicleId: string,
	planId: string,
	inlineParts: number,
): Promise<
	| { plan: Omit<PlanDto, 'document'>; documentParts: number; documentText: string | null }
	| undefined
> {
	const parts = sql<number>`(${sql.join(
		PART_GROUPS.filter((g) => g !== 'nodes').map(
			(g) => sql`coalesce(jsonb_array_length(p.document -> ${g}), 0)`,
		),
		sql` + `,
	)})`;
	const row = await planQuery(db)
		.select([
			parts.as('document_parts'),
			sql<string | null>`case when ${parts} <= ${inlineParts} then p.document::text end`.as(
				'document_text',
			),
		])
		.where('p.vehicle_id', '=', vehicleId)
		.where('p.id', '=', planId)
		.executeTakeFirst();
	if (!row) return undefined;
	return {
		plan: { ...toSummary(row), version: row.version, parts: await findPlanParts(db, planId) },
		documentParts: Number(row.document_parts),
		documentText: row.document_text,
	};
}

/** Each named plan's version, for the vehicle's plans among `planIds` (others are absent). */
export async function findPlanVersions(
	db: Db,
	vehicleId: string,
	planIds: string[],
): Promise<Map<string, number>> {
	if (planIds.length === 0) return new Map();
	const rows = await db
		.selectFrom('plan')
		.select(['id', 'version'])
		.where('vehicle_id', '=', vehicleId)
		.where('id', 'in', planIds)
		.execute();
	return new Map(rows.map((r) => [r.id, r.version]));
}

async function writeParts(trx: Db, planId: string, parts: PlanPartInput[]) {
	await trx.deleteFrom('plan_part').where('plan_id', '=', planId).execute();
	if (parts.length) {
		await trx
			.insertInto('plan_part')
			.values(
				parts.map((p, position) => ({
					plan_id: planId,
					position,
					item: p.item,
					quantity: p.quantity,
					unit_price_minor: toMinor(p.unitPrice),
					link: p.link,
				})),
			)
			.execute();
	}
}

/** Creates a plan with its parts, in one transaction. */
export async function insertPlan(
	db: Db,
	p: {
		vehicleId: string;
		name: string;
		notes: string;
		baseRevisionId: string | null;
		document: BuildDocument;
		createdBy: string | null;
		parts?: PlanPartInput[];
	},
): Promise<string> {
	return db.transaction().execute(async (trx) => {
		const row = await trx
			.insertInto('plan')
			.values({
				vehicle_id: p.vehicleId,
				name: p.name,
				notes: p.notes,
				base_revision_id: p.baseRevisionId,
				schema_version: p.document.schemaVersion,
				document: JSON.stringify(p.document),
				created_by: p.createdBy,
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await writeParts(trx, row.id, p.parts ?? []);
		return row.id;
	});
}

export type UpdatePlanResult =
	{ ok: true } | { ok: false; reason: 'missing' } | { ok: false; reason: 'stale'; version: number };

/** Replaces a plan's name, notes, document and parts in one transaction, when `version` is current. */
export async function updatePlan(
	db: Db,
	vehicleId: string,
	planId: string,
	input: UpdatePlanInput,
): Promise<UpdatePlanResult> {
	return db.transaction().execute(async (trx): Promise<UpdatePlanResult> => {
		const row = await trx
			.selectFrom('plan')
			.select(['id', 'version'])
			.where('id', '=', planId)
			.where('vehicle_id', '=', vehicleId)
			.forUpdate()
			.executeTakeFirst();
		if (!row) return { ok: false, reason: 'missing' };
		if (row.version !== input.version) return { ok: false, reason: 'stale', version: row.version };
		await trx
			.updateTable('plan')
			.set({
				name: input.name,
				notes: input.notes,
				document: JSON.stringify(input.document),
				schema_version: input.document.schemaVersion,
				version: row.version + 1,
				updated_at: new Date(),
			})
			.where('id', '=', planId)
			.execute();
		await writeParts(trx, planId, input.parts);
		return { ok: true };
	});
}

export async function deletePlan(db: Db, vehicleId: string, planId: string): Promise<boolean> {
	const r = await db
		.deleteFrom('plan')
		.where('id', '=', planId)
		.where('vehicle_id', '=', vehicleId)
		.executeTakeFirst();
	return Number(r.numDeletedRows) > 0;
}

/**
 * Installs a plan: its document becomes a new revision on top of `parentId` (still the head, or
 * the save is stale), and the plan records which revision it became — one transaction.
 */
export function installPlan(
	db: Db,
	p: {
		buildId: string;
		planId: string;
		parentId: string | null;
		document: BuildDocument;
		message: string;
		authorId: string;
		/** The plan's parts, recorded as purchases in this season on this day, paid by the author. */
		purchases?: {
			seasonId: string;
			boughtOn: string;
			paidByName: string;
			planName: string;
			parts: PlanPart[];
		};
	},
): Promise<SaveResult> {
	return appendRevision(
		db,
		{
			buildId: p.buildId,
			parentId: p.parentId,
			document: p.document,
			message: p.message,
			authorId: p.authorId,
		},
		async (trx, revision) => {
			await trx
				.updateTable('plan')
				.set({ installed_revision_id: revision.id, installed_at: new Date() })
				.where('id', '=', p.planId)
				.execute();
			const bought = p.purchases;
			if (bought && bought.parts.length)
				await trx
					.insertInto('purchase')
					.values(
						bought.parts.map((part) => ({
							season_id: bought.seasonId,
							bought_on: bought.boughtOn,
							item: part.item,
							quantity: part.quantity,
							unit_price_minor: toMinor(part.unitPrice),
							paid_by: p.authorId,
							paid_by_name: bought.paidByName,
							notes: `From the installed plan “${bought.planName}”`.slice(0, 500),
							created_by: p.authorId,
						})),
					)
					.execute();
		},
	);
}

/** The vehicle's plans that were installed, by the revision they made. */
export async function findInstalledPlans(
	db: Db,
	vehicleId: string,
): Promise<Map<string, { id: string; name: string }>> {
	const rows = await db
		.selectFrom('plan')
		.select(['id', 'name', 'installed_revision_id'])
		.where('vehicle_id', '=', vehicleId)
		.where('installed_revision_id', 'is not', null)
		.execute();
	return new Map(rows.map((p) => [p.installed_revision_id!, { id: p.id, name: p.name }]));
}
