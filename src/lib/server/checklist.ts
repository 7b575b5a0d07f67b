import type { BuildDocument, UnitSystem } from '@/engine';
import type { Checklist } from '@/lib/schemas/checklist';
import { findRevision, revisionInForce } from '@/lib/server/db/builds';
import { findCheckItems, findSignoffs, findVehicleWithBuild } from '@/lib/server/db/checklists';
import { findEvent } from '@/lib/server/db/events';
import { findTeamSettingsRow } from '@/lib/server/db/teams';
import { revisionFigures } from '@/lib/server/engine/summaries';

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
	const at = new Date(`${event.starts_on}T23:59:59Z`);
	const revisionId =
		(await revisionInForce(db, vehicle.id, at > new Date() ? new Date() : at)) ?? null;
	const revision = revisionId ? await findRevision(db, vehicle.build_id, revisionId) : undefined;
	const [signoffs, manual] = await Promise.all([
		findSignoffs(db, event.id, vehicle.id),
		findCheckItems(db, teamId),
	]);
	const signoffOf = (key: string) => {
		const s = signoffs.find((x) => x.item_key === key);
		return s
			? {
					by:
						s.name ?? s.email ?? (s.imported_by ? `imported: ${s.imported_by}` : 'a former member'),
					at: s.signed_at.toISOString(),
					note: s.note,
					waived: s.waived,
				}
			: null;
	};
	const computed = revision
		? revisionFigures(
				{ id: revision.id, document: revision.document as BuildDocument },
				fuseDistanceM,
				units,
			).checks
		: [
				{
					key: 'has_build',
					label: 'The vehicle has a saved build',
					status: 'fail' as const,
					reasons: ['No revision of the build existed by the event.'],
				},
			];
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
		items: [
			...computed.map((c) => {
				const signoff = signoffOf(c.key);
				// A failing item stands until a captain waives it; an older sign-off of it (given
				// while it passed, or before the build changed) does not clear it.
				return {
					...c,
					kind: 'computed' as const,
					signoff,
					outstanding: c.status === 'fail' && !signoff?.waived,
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
					signoff,
					outstanding: !signoff,
				};
			}),
		],
	};
}
