import type { Migration } from 'kysely';
import * as createTeamAndVehicle from './2026_12_01_120000_create_team_and_vehicle';
import * as createAccounts from './2026_12_01_130000_create_accounts_and_memberships';
import * as createBuilds from './2026_12_01_140000_create_builds_and_revisions';
import * as createEvents from './2026_12_01_150000_create_events_and_runs';
import * as createNotifications from './2026_12_01_160000_create_notifications';
import * as createChecks from './2026_12_01_170000_create_pre_event_checks';
import * as createPlans from './2026_12_01_180000_create_plans';
import * as hardenAccounts from './2026_12_02_090000_harden_accounts_and_imports';
import * as trustworthyRecords from './2026_12_02_190000_trustworthy_records';
import * as teamDataVersion from './2026_12_04_130000_team_data_version';
import * as waiverScope from './2026_12_05_090000_waiver_scope';
import * as partsShelf from './2026_12_05_160000_parts_shelf';
import * as seasonBudget from './2026_12_05_170000_season_budget';
import * as commentThreads from './2026_12_05_190000_comment_threads';
import * as purchaseReceipts from './2026_12_05_200000_purchase_receipts';

/**
 * Every migration, by name, in the order they apply. Listed explicitly (rather than read from the
 * folder at run time) so the same code runs under tsx, Vitest and the Astro bundle on Node 20,
 * which cannot import .ts files natively. Add new files at the end.
 */
export const migrations: Record<string, Migration> = {
	'2026_12_01_120000_create_team_and_vehicle': createTeamAndVehicle,
	'2026_12_01_130000_create_accounts_and_memberships': createAccounts,
	'2026_12_01_140000_create_builds_and_revisions': createBuilds,
	'2026_12_01_150000_create_events_and_runs': createEvents,
	'2026_12_01_160000_create_notifications': createNotifications,
	'2026_12_01_170000_create_pre_event_checks': createChecks,
	'2026_12_01_180000_create_plans': createPlans,
	'2026_12_02_090000_harden_accounts_and_imports': hardenAccounts,
	'2026_12_02_190000_trustworthy_records': trustworthyRecords,
	'2026_12_04_130000_team_data_version': teamDataVersion,
	'2026_12_05_090000_waiver_scope': waiverScope,
	'2026_12_05_160000_parts_shelf': partsShelf,
	'2026_12_05_170000_season_budget': seasonBudget,
	'2026_12_05_190000_comment_threads': commentThreads,
	'2026_12_05_200000_purchase_receipts': purchaseReceipts,
};
