import { z } from '@/lib/zod';
import { lineText } from './text';

export const emailSchema = z
	.string({ error: 'Enter your e-mail address' })
	.trim()
	.toLowerCase()
	.pipe(
		z
			.email({ error: 'That does not look like an e-mail address' })
			.max(254, 'That address is too long'),
	);

export const passwordSchema = z
	.string({ error: 'Enter a password' })
	.min(10, 'Use at least 10 characters')
	.max(200, 'Keep it under 200 characters');

export const signUpSchema = z.object({
	name: lineText(80, { required: 'Tell the team your name' }),
	email: emailSchema,
	password: passwordSchema,
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const signInSchema = z.object({
	email: emailSchema,
	password: z.string().min(1, 'Enter your password').max(200),
});

export const passwordResetRequestSchema = z.object({ email: emailSchema });
export const passwordResetConfirmSchema = z.object({
	token: z.string().min(20, 'This reset link is not valid').max(200),
	password: passwordSchema,
});

export const roleSchema = z.enum(['captain', 'member', 'viewer'], {
	error: 'Role is captain, member or viewer',
});

export const teamNameSchema = lineText(80, { required: 'Give the team a name' });
export const newTeamSchema = z.object({ name: teamNameSchema });
export const renameTeamSchema = z
	.object({
		name: teamNameSchema.optional(),
		reminderDays: z
			.number({ error: 'Days must be a number' })
			.int('Whole days')
			.min(0, 'From 0 days')
			.max(60, 'At most 60 days')
			.optional(),
		/** ISO 4217 code plan prices are in (prices are not converted when it changes). */
		currency: z
			.string()
			.trim()
			.toUpperCase()
			.regex(/^[A-Z]{3}$/, 'Use a three-letter currency code such as EUR')
			.optional(),
		/** Whether viewers (a sponsor, an advising shop) may comment in the team's threads. */
		viewersMayComment: z.boolean({ error: 'viewersMayComment is true or false' }).optional(),
	})
	.refine(
		(v) =>
			v.name !== undefined ||
			v.reminderDays !== undefined ||
			v.currency !== undefined ||
			v.viewersMayComment !== undefined,
		'Nothing to change',
	);
export const deleteTeamSchema = z.object({
	confirmName: z.string({ error: 'Type the team name to confirm' }),
});

export const newInvitationSchema = z.object({ email: emailSchema, role: roleSchema });
export const changeRoleSchema = z.object({ role: roleSchema });
