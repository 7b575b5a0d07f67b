/**
 * The database, typed by hand beside the migrations (one interface per table).
 * Measured quantities are double precision in SI units; build documents are JSONB.
 */
import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;

export interface TeamTable {
	id: Generated<string>;
	name: string;
	created_at: Generated<Timestamp>;
}

export interface VehicleTable {
	id: Generated<string>;
	team_id: string;
	name: string;
	description: Generated<string>;
	competition_class: Generated<string>;
	notes: Generated<string>;
	archived_at: Timestamp | null;
	created_at: Generated<Timestamp>;
}

export interface Database {
	team: TeamTable;
	vehicle: VehicleTable;
}

export type TeamRow = Selectable<TeamTable>;
export type NewTeamRow = Insertable<TeamTable>;
export type VehicleRow = Selectable<VehicleTable>;
export type NewVehicleRow = Insertable<VehicleTable>;
export type VehicleRowUpdate = Updateable<VehicleTable>;
