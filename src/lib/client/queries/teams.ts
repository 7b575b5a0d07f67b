import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { ImportSummary, InvitationDto, MemberDto } from '@/lib/schemas/teams';
import { api, getJson } from '@/lib/client/api-client';

export type { InvitationDto, MemberDto };
export type Role = MemberDto['role'];

export const teamKeys = {
	all: ['teams'] as const,
	members: (teamId: string) => [...teamKeys.all, teamId, 'members'] as const,
	invitations: (teamId: string) => [...teamKeys.all, teamId, 'invitations'] as const,
};

export const membersQueryOptions = (teamId: string) =>
	queryOptions({
		queryKey: teamKeys.members(teamId),
		queryFn: ({ signal }) => getJson<MemberDto[]>(`/api/teams/${teamId}/members`, { signal }),
	});

export const invitationsQueryOptions = (teamId: string) =>
	queryOptions({
		queryKey: teamKeys.invitations(teamId),
		queryFn: ({ signal }) =>
			getJson<InvitationDto[]>(`/api/teams/${teamId}/invitations`, { signal }),
	});

export function useInvite(teamId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (input: { email: string; role: Role }) =>
			api<InvitationDto>(`/api/teams/${teamId}/invitations`, { json: input }),
		onSettled: () => qc.invalidateQueries({ queryKey: teamKeys.invitations(teamId) }),
	});
}

export function useInvitationAction(teamId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: ({ id, action }: { id: string; action: 'resend' | 'revoke' }) =>
			api(
				`/api/teams/${teamId}/invitations/${id}${action === 'resend' ? '/resend' : ''}`,
				action === 'resend' ? { json: {} } : { method: 'DELETE' },
			),
		onSettled: () => qc.invalidateQueries({ queryKey: teamKeys.invitations(teamId) }),
	});
}

export function useMemberAction(teamId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: ({ userId, role }: { userId: string; role: Role | null }) =>
			api(
				`/api/teams/${teamId}/members/${userId}`,
				role ? { method: 'PATCH', json: { role } } : { method: 'DELETE' },
			),
		onSettled: () => qc.invalidateQueries({ queryKey: teamKeys.members(teamId) }),
	});
}

export function useCreateTeam() {
	return useMutation({
		mutationFn: (input: { name: string }) =>
			api<{ id: string; name: string }>('/api/teams', { json: input }),
	});
}

/** Changes the team's name, currency or reminder days (captains). */
export function useUpdateTeam(teamId: string) {
	return useMutation({
		mutationFn: (changes: {
			name?: string;
			currency?: string;
			reminderDays?: number;
			viewersMayComment?: boolean;
		}) => api(`/api/teams/${teamId}`, { method: 'PATCH', json: changes }),
	});
}

export function useDeleteTeam(teamId: string) {
	return useMutation({
		mutationFn: (confirmName: string) =>
			api(`/api/teams/${teamId}`, { method: 'DELETE', json: { confirmName } }),
	});
}

export function useAcceptInvitation(token: string) {
	return useMutation({
		mutationFn: () => api<{ teamId: string }>(`/api/invitations/${token}/accept`, { json: {} }),
	});
}

/** Restores a backup file as a new team, reporting the upload's progress. */
export function useImportTeam() {
	return useMutation({
		mutationFn: ({
			file,
			name,
			onProgress,
		}: {
			file: File;
			name: string;
			onProgress: (percent: number) => void;
		}) => {
			const form = new FormData();
			form.set('file', file);
			if (name.trim()) form.set('name', name.trim());
			return api<ImportSummary>('/api/teams/import', { form, onUploadProgress: onProgress });
		},
	});
}
