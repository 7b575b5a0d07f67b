import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/client/api-client';

export function useSignUp() {
	return useMutation({
		mutationFn: (input: { email: string; name: string; password: string }) =>
			api('/api/account/sign-up', { json: input }),
	});
}

export function useRequestPasswordReset() {
	return useMutation({
		mutationFn: (input: { email: string }) => api('/api/account/password-reset', { json: input }),
	});
}

export function useConfirmPasswordReset() {
	return useMutation({
		mutationFn: (input: { token: string; password: string }) =>
			api('/api/account/password-reset/confirm', { json: input }),
	});
}

/** Feet/AWG or metres/mm², remembered on the account. */
export function useSetUnits() {
	return useMutation({
		mutationFn: (unitSystem: 'imperial' | 'metric') =>
			api('/api/account/preferences', { method: 'PATCH', json: { unitSystem } }),
	});
}
