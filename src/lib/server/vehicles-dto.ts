import type { VehicleRow } from '@/lib/server/db/schema';

export interface VehicleDto {
	id: string;
	name: string;
	description: string;
	competitionClass: string;
	notes: string;
	ownerId: string | null;
	archived: boolean;
	createdAt: string;
	headRevisionId: string | null;
}

export function toVehicleDto(v: VehicleRow, headRevisionId: string | null): VehicleDto {
	return {
		id: v.id,
		name: v.name,
		description: v.description,
		competitionClass: v.competition_class,
		notes: v.notes,
		ownerId: v.owner_id,
		archived: v.archived_at !== null,
		createdAt: v.created_at.toISOString(),
		headRevisionId,
	};
}
