import { LRUCache } from 'lru-cache';
import type { HeadlineFigures, UnitSystem } from '@/engine';
import type { TeamAccess } from '@/lib/server/access';
import { checklistCounts } from '@/lib/server/checklist';
import { findRevisionDocuments } from '@/lib/server/db/builds';
import { findRecentActivity, type ActivityEntry } from '@/lib/server/db/activity';
import { findEvents } from '@/lib/server/db/events';
import { findDailyBestScores, findLastRuns } from '@/lib/server/db/runs';
import { runVoltage } from '@/lib/run-figures';
import { findTeamSettingsRow } from '@/lib/server/db/teams';
import { findVehiclesWithHead } from '@/lib/server/db/vehicles';
import { cachedRevisionFigures, revisionFigures } from '@/lib/server/engine/summaries';
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
	/** Every event of the team, by start date. */
	events: EventDto[];
	nextEvent: EventDto | null;
	vehicles: SeasonVehicle[];
	activity: ActivityEntry[];
	/** Every scored run of the team, oldest first, for the season chart. */
	/** Each vehicle's best score of each day it scored (`runs`: how many scored runs that day). */
	scores: Array<{ vehicleName: string; ranAt: string; scoreDb: number; runs: number }>;
}

/**
 * The team page's season at a glance: each vehicle's head revision figures, last run and checks
 * for the next event; the team's recent activity; every vehicle's best score of each day.
 */
export async function loadSeason(
	db: App.Locals['db'],
	teamId: string,
	units: UnitSystem,
	today = new Date().toISOString().slice(0, 10),
): Promise<Season> {
	const [vehicles, events, settings, activity, lastRunList, scores] = await Promise.all([
		findVehiclesWithHead(db, teamId),
		findEvents(db, teamId),
		findTeamSettingsRow(db, teamId),
		findRecentActivity(db, teamId),
		findLastRuns(db, teamId),
		findDailyBestScores(db, teamId),
	]);
	// Each vehicle's newest run and the chart's daily points come from the database ready-made: the
	// page never reads the whole season's runs.
	const lastRuns = new Map(lastRunList.map((r) => [r.vehicleId, r]));
	const nextEvent = events.find((e) => e.endsOn >= today) ?? null;
	const fuseDistanceM = settings.fuse_distance_m;
	// Head documents come from the database only for revisions this instance has not summarised.
	const [checklists, documents] = await Promise.all([
		nextEvent
			? checklistCounts(
					db,
					teamId,
					nextEvent,
					vehicles.map((v) => v.id),
					fuseDistanceM,
					units,
				)
			: null,
		findRevisionDocuments(
			db,
			vehicles
				.map((v) => v.revision_id)
				.filter((id): id is string => !!id && !cachedRevisionFigures(id, fuseDistanceM, units)),
		),
	]);
	// Figures this instance has not summarised yet are worked out in the engine's pool, together.
	const figures = new Map(
		await Promise.all(
			vehicles
				.map((v) => v.revision_id)
				.filter((id): id is string => !!id)
				.map(async (revisionId) => {
					const hit = cachedRevisionFigures(revisionId, fuseDistanceM, units);
					if (hit) return [revisionId, hit.headline] as const;
					const document = documents.get(revisionId);
					return [
						revisionId,
						document
							? (
									await revisionFigures({ id: revisionId, document }, fuseDistanceM, units, {
										team: teamId,
									})
								).headline
							: null,
					] as const;
				}),
		),
	);
	const headFigures = (revisionId: string) => figures.get(revisionId) ?? null;
	return {
		events,
		nextEvent,
		vehicles: vehicles.map((v) => {
			const last = lastRuns.get(v.id);
			const list = checklists?.get(v.id);
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
								figures: headFigures(v.revision_id),
							}
						: null,
				lastRun: last
					? {
							ranAt: new Date(last.ranAt),
							scoreDb: last.scoreDb,
							minV: runVoltage(last, 'minV').value,
						}
					: null,
				nextChecks: list ?? null,
			};
		}),
		activity,
		scores,
	};
}

/**
 * Seasons worked out by this instance, by team, the team's data version, units and day. The
 * database bumps the version in the same commit as any change the season reads, and every request
 * reads it with its membership check, so an entry is never served after a change, whichever
 * instance made it. A load is shared by the requests that arrive while it runs; a failed one is
 * dropped so the next request tries again.
 */
const seasons = new LRUCache<string, Promise<Season>>({ max: 200 });

/** loadSeason, or what this instance already loaded for the same team version, units and day. */
export function loadSeasonCached(
	db: App.Locals['db'],
	access: Pick<TeamAccess, 'teamId' | 'dataVersion'>,
	units: UnitSystem,
	today = new Date().toISOString().slice(0, 10),
): Promise<Season> {
	const key = `${access.teamId}|${access.dataVersion}|${units}|${today}`;
	const hit = seasons.get(key);
	if (hit) return hit;
	const loading = loadSeason(db, access.teamId, units, today);
	seasons.set(key, loading);
	loading.catch(() => {
		if (seasons.get(key) === loading) seasons.delete(key);
	});
	return loading;
}
