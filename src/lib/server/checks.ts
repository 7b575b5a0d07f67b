import { computedChecks } from '@/engine/checks';
import { buildReport } from '@/engine/report';
import type { BuildDocument } from '@/engine/types';
import { findRevision } from './db/builds';
import { revisionInForce } from './db/runs';

export interface ChecklistItem {
	key: string;
	label: string;
	kind: 'computed' | 'manual';
	/** Computed result; manual items are 'open' until signed off. */
	status: 'pass' | 'fail' | 'open';
	reasons: string[];
	signoff: { by: string | null; at: string; note: string } | null;
}

export interface Checklist {
	eventId: string;
	eventName: string;
	startsOn: string;
	vehicleId: string;
	vehicleName: string;
	revision: { id: string; number: number } | null;
	fuseDistanceM: number;
	items: ChecklistItem[];
}

/**
 * The pre-event checklist of a vehicle for an event: items computed from the revision in force on
 * the event's first day (the newest one when the event is ahead), the team's manual items, and who
 * signed off what.
 */
export async function loadChecklist(db: App.Locals['db'], teamId: string, eventId: string, vehicleId: string): Promise<Checklist | null> {
	const event = await db.selectFrom('event').selectAll().where('team_id', '=', teamId).where('id', '=', eventId).executeTakeFirst();
	const vehicle = await db.selectFrom('vehicle as v').innerJoin('build as b', 'b.vehicle_id', 'v.id').select(['v.id', 'v.name', 'b.id as build_id']).where('v.team_id', '=', teamId).where('v.id', '=', vehicleId).executeTakeFirst();
	if (!event || !vehicle) return null;
	const team = await db.selectFrom('team').select('fuse_distance_m').where('id', '=', teamId).executeTakeFirstOrThrow();
	const at = new Date(`${event.starts_on}T23:59:59Z`);
	const revisionId = (await revisionInForce(db, vehicle.id, at > new Date() ? new Date() : at)) ?? null;
	const revision = revisionId ? await findRevision(db, vehicle.build_id, revisionId) : undefined;
	const signoffs = await db
		.selectFrom('check_signoff as s')
		.leftJoin('User as u', 'u.id', 's.signed_by')
		.select(['s.item_key', 's.signed_at', 's.note', 's.imported_by', 'u.name', 'u.email'])
		.where('s.event_id', '=', event.id)
		.where('s.vehicle_id', '=', vehicle.id)
		.execute();
	const signoffOf = (key: string) => {
		const s = signoffs.find((x) => x.item_key === key);
		return s ? { by: s.name ?? s.email ?? (s.imported_by ? `imported: ${s.imported_by}` : 'a former member'), at: s.signed_at.toISOString(), note: s.note } : null;
	};
	const computed = revision
		? computedChecks(buildReport(revision.document as BuildDocument, { fuseDistanceM: team.fuse_distance_m }, { burpRun: false }))
		: [{ key: 'has_build', label: 'The vehicle has a saved build', status: 'fail' as const, reasons: ['No revision of the build existed by the event.'] }];
	const manual = await db.selectFrom('check_item').select(['id', 'label']).where('team_id', '=', teamId).orderBy('created_at').execute();
	return {
		eventId: event.id,
		eventName: event.name,
		startsOn: event.starts_on,
		vehicleId: vehicle.id,
		vehicleName: vehicle.name,
		revision: revision ? { id: revision.id, number: revision.number } : null,
		fuseDistanceM: team.fuse_distance_m,
		items: [
			...computed.map((c) => ({ ...c, kind: 'computed' as const, signoff: signoffOf(c.key) })),
			...manual.map((m) => ({ key: `manual:${m.id}`, label: m.label, kind: 'manual' as const, status: 'open' as const, reasons: [], signoff: signoffOf(`manual:${m.id}`) })),
		],
	};
}
