import type { BuildDocument, HeadlineFigures, UnitSystem } from '@/engine';
import { loadChecklist } from '@/lib/server/checklist';
import { findRecentActivity, type ActivityEntry } from '@/lib/server/db/activity';
import { findEvents } from '@/lib/server/db/events';
import { findLastRuns, findRuns } from '@/lib/server/db/runs';
import { findTeamSettingsRow } from '@/lib/server/db/teams';
import { findVehiclesWithHead } from '@/lib/server/db/vehicles';
import { revisionFigures } from '@/lib/server/engine/summaries';
import type { EventDto } from '@/lib/schemas/events';

export interface SeasonVehicle {
	id: string;
	name: string;
	description: string;
	competitionClass: string;
	head: {
		number: number;
		message: string;
		savedAt: Date;
		/** Null when the engine cannot solve the head revision. */
		figures: HeadlineFigures | null;
	} | null;
	lastRun: { ranAt: Date; scoreDb: number | null; minV: number | null } | null;
	/** The next event's checklist: how many items are still open (0 = done). */
	nextChecks: { outstanding: number; total: number } | null;
}

export interface Season {
	nextEvent: EventDto | null;
	vehicles: SeasonVehicle[];
	activity: ActivityEntry[];
	/** Every scored run of the team, oldest first, for the season chart. */
	scores: Array<{ vehicleName: string; ranAt: string; scoreDb: number }>;
}

/**
 * The team page's season at a glance: each vehicle's head revision figures, last run and checks
 * for the next event; the team's recent activity; every vehicle's scores over the season.
 */
export async function loadSeason(
	db: App.Locals['db'],
	teamId: string,
	units: UnitSystem,
	today = new Date().toISOString().slice(0, 10),
): Promise<Season> {
	const [vehicles, lastRuns, events, settings, activity, runs] = await Promise.all([
		findVehiclesWithHead(db, teamId),
		findLastRuns(db, teamId),
		findEvents(db, teamId),
		findTeamSettingsRow(db, teamId),
		findRecentActivity(db, teamId),
		findRuns(db, teamId),
	]);
	const nextEvent = events.find((e) => e.endsOn >= today) ?? null;
	const checklists = nextEvent
		? await Promise.all(vehicles.map((v) => loadChecklist(db, teamId, nextEvent.id, v.id, units)))
		: [];
	return {
		nextEvent,
		vehicles: vehicles.map((v, i) => {
			const last = lastRuns.find((r) => r.vehicle_id === v.id);
			const list = checklists[i];
			return {
				id: v.id,
				name: v.name,
				description: v.description,
				competitionClass: v.competition_class,
				head:
					v.revision_id && v.revision_number !== null && v.revision_created_at
						? {
								number: v.revision_number,
								message: v.revision_message ?? '',
								savedAt: v.revision_created_at,
								figures: revisionFigures(
									{ id: v.revision_id, document: v.document as BuildDocument },
									settings.fuse_distance_m,
									units,
								).headline,
							}
						: null,
				lastRun: last ? { ranAt: last.ran_at, scoreDb: last.score_db, minV: last.min_v } : null,
				nextChecks: list
					? {
							outstanding: list.items.filter((x) => x.outstanding).length,
							total: list.items.length,
						}
					: null,
			};
		}),
		activity,
		scores: runs
			.filter((r) => r.scoreDb !== null)
			.map((r) => ({ vehicleName: r.vehicleName, ranAt: r.ranAt, scoreDb: r.scoreDb! })),
	};
}
