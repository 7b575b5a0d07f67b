import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { InvitationDto, MemberDto } from '@/lib/server/db/teams';
import { getJson, postJson, sendJson } from '../api-client';

export type { InvitationDto, MemberDto };
export type Role = MemberDto['role'];

export const teamKeys = {
	all: ['teams'] as const,
	members: (teamId: string) => [...teamKeys.all, teamId, 'members'] as const,
	invitations: (teamId: string) => [...teamKeys.all, teamId, 'invitations'] as const,
};

export const membersQueryOptions = (teamId: string) =>
	queryOptions({ queryKey: teamKeys.members(teamId), queryFn: ({ signal }) => getJson<MemberDto[]>(`/api/teams/${teamId}/members`, { signal }) });

export const invitationsQueryOptions = (teamId: string) =>
	queryOptions({ queryKey: teamKeys.invitations(teamId), queryFn: ({ signal }) => getJson<InvitationDto[]>(`/api/teams/${teamId}/invitations`, { signal }) });

export function useInvite(teamId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (input: { email: string; role: Role }) => postJson<InvitationDto>(`/api/teams/${teamId}/invitations`, input),
		onSettled: () => qc.invalidateQueries({ queryKey: teamKeys.invitations(teamId) }),
	});
}

export function useInvitationAction(teamId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: ({ id, action }: { id: string; action: 'resend' | 'revoke' }) =>
			action === 'resend' ? postJson(`/api/teams/${teamId}/invitations/${id}/resend`) : sendJson(`/api/teams/${teamId}/invitations/${id}`, 'DELETE'),
		onSettled: () => qc.invalidateQueries({ queryKey: teamKeys.invitations(teamId) }),
	});
}

export function useMemberAction(teamId: string) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: ({ userId, role }: { userId: string; role: Role | null }) =>
			role ? sendJson(`/api/teams/${teamId}/members/${userId}`, 'PATCH', { role }) : sendJson(`/api/teams/${teamId}/members/${userId}`, 'DELETE'),
		onSettled: () => qc.invalidateQueries({ queryKey: teamKeys.members(teamId) }),
	});
}
