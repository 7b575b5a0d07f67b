import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api, getJson } from '@/lib/client/api-client';
import type {
	CommentWriteResult,
	MailChoice,
	NotificationsDto,
	ThreadDto,
	ThreadSubject,
} from '@/lib/schemas/comments';

export type { CommentWriteResult, NotificationsDto, ThreadDto, ThreadSubject };

export const commentKeys = {
	all: ['comments'] as const,
	thread: (teamId: string, s: ThreadSubject) => [...commentKeys.all, teamId, s.on, s.id] as const,
	notifications: ['notifications'] as const,
};

const threadUrl = (teamId: string, s: ThreadSubject) =>
	`/api/teams/${teamId}/comments?on=${s.on}&id=${encodeURIComponent(s.id)}`;

export const threadQueryOptions = (teamId: string, s: ThreadSubject) =>
	queryOptions({
		queryKey: commentKeys.thread(teamId, s),
		queryFn: ({ signal }) => getJson<ThreadDto>(threadUrl(teamId, s), { signal }),
	});

export function useAddComment(teamId: string, s: ThreadSubject) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (body: string) =>
			api<CommentWriteResult>(`/api/teams/${teamId}/comments`, { json: { ...s, body } }),
		onSettled: () => qc.invalidateQueries({ queryKey: commentKeys.thread(teamId, s) }),
	});
}

export function useEditComment(teamId: string, s: ThreadSubject) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (input: { id: string; body: string }) =>
			api<CommentWriteResult>(`/api/teams/${teamId}/comments/${input.id}`, {
				method: 'PATCH',
				json: { body: input.body },
			}),
		onSettled: () => qc.invalidateQueries({ queryKey: commentKeys.thread(teamId, s) }),
	});
}

export function useDeleteComment(teamId: string, s: ThreadSubject) {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (id: string) => api(`/api/teams/${teamId}/comments/${id}`, { method: 'DELETE' }),
		onSettled: () => qc.invalidateQueries({ queryKey: commentKeys.thread(teamId, s) }),
	});
}

export const notificationsQueryOptions = () =>
	queryOptions({
		queryKey: commentKeys.notifications,
		queryFn: ({ signal }) => getJson<NotificationsDto>('/api/notifications', { signal }),
	});

export function useMarkRead() {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (which: { all: true } | { ids: string[] }) =>
			api<{ marked: number; unread: number }>('/api/notifications/read', { json: which }),
		onSuccess: (r) => window.dispatchEvent(new CustomEvent('sagwise:unread', { detail: r.unread })),
		onSettled: () => qc.invalidateQueries({ queryKey: commentKeys.notifications }),
	});
}

export function useSetMentionMail() {
	const qc = useQueryClient();
	return useMutation({
		mutationFn: (mentionMail: MailChoice) =>
			api('/api/account/preferences', { method: 'PATCH', json: { mentionMail } }),
		onSettled: () => qc.invalidateQueries({ queryKey: commentKeys.notifications }),
	});
}
