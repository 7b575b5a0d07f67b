import { z } from '@/lib/zod';

export const roleSchema = z.enum(['captain', 'member', 'viewer']);
export type Role = z.infer<typeof roleSchema>;

/** A team in the signed-in person's list. */
export const teamSummarySchema = z.object({
	id: z.uuid(),
	name: z.string(),
	role: roleSchema,
	members: z.number().int(),
	vehicles: z.number().int(),
});
export type TeamSummary = z.infer<typeof teamSummarySchema>;

/** The team's own settings, as its members see them. */
export const teamSettingsSchema = z.object({
	id: z.uuid(),
	name: z.string(),
	role: roleSchema,
	currency: z.string(),
	reminderDays: z.number().int(),
	fuseDistanceM: z.number(),
	/** Whether viewers may write in the team's threads (off unless a captain allows it). */
	viewersMayComment: z.boolean(),
});
export type TeamSettingsDto = z.infer<typeof teamSettingsSchema>;

export const memberDtoSchema = z.object({
	userId: z.string(),
	name: z.string().nullable(),
	email: z.string(),
	role: roleSchema,
	joinedAt: z.string(),
});
export type MemberDto = z.infer<typeof memberDtoSchema>;

export const invitationDtoSchema = z.object({
	id: z.uuid(),
	email: z.string(),
	role: roleSchema,
	invitedBy: z.string().nullable(),
	createdAt: z.string(),
	lastSentAt: z.string(),
	expiresAt: z.string(),
	expired: z.boolean(),
});
export type InvitationDto = z.infer<typeof invitationDtoSchema>;

/** What a restored backup brought in. */
export const importSummarySchema = z.object({
	teamId: z.uuid(),
	name: z.string(),
	members: z.number().int(),
	invitations: z.number().int(),
	vehicles: z.number().int(),
	revisions: z.number().int(),
	plans: z.number().int(),
	events: z.number().int(),
	runs: z.number().int(),
	files: z.number().int(),
	/** Photos whose metadata (EXIF, GPS, XMP) was removed on the way in. */
	photosCleaned: z.number().int(),
});
export type ImportSummary = z.infer<typeof importSummarySchema>;

/** A manual item the team added to every pre-event checklist. */
export const checkItemDtoSchema = z.object({ id: z.uuid(), label: z.string() });
export type CheckItemDto = z.infer<typeof checkItemDtoSchema>;
