import {
	type ComputedCheck,
	waiverStillHolds,
	type BuildDocument,
	type UnitSystem,
} from '@/engine';
import type { Checklist } from '@/lib/schemas/checklist';
import {
	findRevision,
	findRevisionDocuments,
	revisionInForce,
	revisionsInForce,
} from '@/lib/server/db/builds';
import {
	findCheckItems,
	findEventSignoffs,
	findSignoffs,
	findVehicleWithBuild,
} from '@/lib/server/db/checklists';
import { findEvent } from '@/lib/server/db/events';
import { findTeamSettingsRow } from '@/lib/server/db/teams';
import { cachedRevisionFigures, revisionFigures } from '@/lib/server/engine/summaries';
import type { CheckItemDto } from '@/lib/schemas/teams';

/**
 * The pre-event checklist of a vehicle for an event: items computed from the revision in force on
 * the event's first day (the newest one when the event is ahead), the team's manual items, and who
 * signed off what.
 */
export async function loadChecklist(
	db: App.Locals['db'],
	teamId: string,
	eventId: string,
	vehicleId: string,
	units: UnitSystem,
): Promise<Checklist | null> {
	const [event, vehicle] = await Promise.all([
		findEvent(db, teamId, eventId),
		findVehicleWithBuild(db, teamId, vehicleId),
	]);
	if (!event || !vehicle) return null;
	const team = await findTeamSettingsRow(db, teamId);
	const fuseDistanceM = team.fuse_distance_m;
	const revisionId =
		(await revisionInForce(db, vehicle.id, checklistMoment(event.starts_on))) ?? null;
	const revision = revisionId ? await findRevision(db, vehicle.build_id, revisionId) : undefined;
	const [signoffs, manual] = await Promise.all([
		findSignoffs(db, event.id, vehicle.id),
		findCheckItems(db, teamId),
	]);
	const computed = revision
		? (
				await revisionFigures(
					{ id: revision.id, document: revision.document as BuildDocument },
					fuseDistanceM,
					units,
					{ team: teamId },
				)
			).checks
		: null;
	return {
		teamName: team.name,
		eventId: event.id,
		eventName: event.name,
		eventPlace: event.place,
		startsOn: event.starts_on,
		vehicleId: vehicle.id,
		vehicleName: vehicle.name,
		vehicleClass: vehicle.competition_class,
		revision: revision
			? {
					id: revision.id,
					number: revision.number,
					message: revision.message,
					savedAt: revision.createdAt,
				}
			: null,
		fuseDistanceM,
		units,
		items: checklistItems(computed, manual, signoffs, revision?.id ?? null),
	};
}

type SignoffRow = Awaited<ReturnType<typeof findSignoffs>>[number];

/** The day a checklist is computed for: the event's first day, or now when that is ahead. */
function checklistMoment(startsOn: string): Date {
	const at = new Date(`${startsOn}T23:59:59Z`);
	return at > new Date() ? new Date() : at;
}

/**
 * A checklist's items: the computed checks of the revision in force (null: there was none), then
 * the team's manual items, each with its sign-off.
 */
function checklistItems(
	computed: ComputedCheck[] | null,
	manual: CheckItemDto[],
	signoffs: SignoffRow[],
	revisionId: string | null,
): Checklist['items'] {
	const signoffOf = (key: string) => {
		const s = signoffs.find((x) => x.item_key === key);
		return s
			? {
					row: s,
					dto: {
						by:
							s.name ??
							s.email ??
							(s.imported_by ? `imported: ${s.imported_by}` : 'a former member'),
						at: s.signed_at.toISOString(),
						note: s.note,
						waived: s.waived,
						revisionNumber: s.revision_number ?? null,
						reopened: null as string | null,
					},
				}
			: null;
	};
	return [
		...(
			computed ?? [
				{
					key: 'has_build',
					label: 'The vehicle has a saved build',
					status: 'fail' as const,
					reasons: ['No revision of the build existed by the event.'],
					measure: null,
				},
			]
		).map((c) => {
			const found = signoffOf(c.key);
			const signoff = found?.dto ?? null;
			// A failing item stands until a captain waives it; an older sign-off of it (given while it
			// passed, or before the build changed) does not clear it. A waiver covers the revision it
			// was given on, and later ones only while they make the item no worse.
			let waived = !!signoff?.waived;
			if (found && signoff?.waived && c.status === 'fail') {
				const holds = waiverStillHolds(
					{
						revisionId: found.row.revision_id,
						value: found.row.waived_value,
						reasons: found.row.waived_reasons,
					},
					{ revisionId, check: c },
				);
				if (!holds) {
					waived = false;
					const on = signoff.revisionNumber ? ` on r${signoff.revisionNumber}` : '';
					signoff.reopened =
						c.measure && found.row.waived_value !== null
							? `Waived${on} at ${found.row.waived_value.toFixed(2)} V; now ${c.measure.text}`
							: `Waived${on}; it now fails for more than the waiver accepted`;
				}
			}
			return {
				...c,
				kind: 'computed' as const,
				signoff,
				outstanding: c.status === 'fail' && !waived,
			};
		}),
		...manual.map((m) => {
			const signoff = signoffOf(`manual:${m.id}`);
			return {
				key: `manual:${m.id}`,
				label: m.label,
				kind: 'manual' as const,
				status: 'open' as const,
				reasons: [],
				measure: null,
				signoff: signoff?.dto ?? null,
				outstanding: !signoff,
			};
		}),
	];
}

/**
 * How many items of each vehicle's checklist for an event are still open, for many vehicles at
 * once (the team page): the same items as `loadChecklist`, from a fixed handful of queries
 * whatever the number of vehicles, and engine work only for revisions this instance has not
 * summarised yet.
 */
export async function checklistCounts(
	db: App.Locals['db'],
	teamId: string,
	event: { id: string; startsOn: string },
	vehicleIds: string[],
	fuseDistanceM: number,
	units: UnitSystem,
): Promise<Map<string, { outstanding: number; total: number }>> {
	const [inForce, signoffs, manual] = await Promise.all([
		revisionsInForce(db, teamId, checklistMoment(event.startsOn)),
		findEventSignoffs(db, event.id),
		findCheckItems(db, teamId),
	]);
	const missing = vehicleIds
		.map((v) => inForce.get(v))
		.filter((id): id is string => !!id && !cachedRevisionFigures(id, fuseDistanceM, units));
	const documents = await findRevisionDocuments(db, missing);
	const counts = new Map<string, { outstanding: number; total: number }>();
	const figures = new Map(
		await Promise.all(
			vehicleIds.map(async (vehicleId) => {
				const revisionId = inForce.get(vehicleId);
				const document = revisionId ? documents.get(revisionId) : undefined;
				const found = revisionId
					? (cachedRevisionFigures(revisionId, fuseDistanceM, units) ??
						(document
							? await revisionFigures({ id: revisionId, document }, fuseDistanceM, units, {
									team: teamId,
								})
							: null))
					: null;
				return [vehicleId, found?.checks ?? null] as const;
			}),
		),
	);
	for (const vehicleId of vehicleIds) {
		const revisionId = inForce.get(vehicleId);
		const computed = figures.get(vehicleId) ?? null;
		const items = checklistItems(
			computed,
			manual,
			signoffs.filter((s) => s.vehicle_id === vehicleId),
			revisionId ?? null,
		);
		counts.set(vehicleId, {
			outstanding: items.filter((x) => x.outstanding).length,
			total: items.length,
		});
	}
	return counts;
}
