import { useState } from 'react';
import { useTypedState } from '@/lib/client/typed-before-hydration';
import { passwordResetConfirmSchema, passwordResetRequestSchema } from '@/lib/schemas/account';
import { ApiError } from '@/lib/client/api-client';
import { useConfirmPasswordReset, useRequestPasswordReset } from '@/lib/client/queries/account';
import { withQueryClient } from '@/lib/client/query-client';
import { fieldErrors } from '@/lib/client/form-errors';
import { Button, Field, FormMessage } from '@/components/ui/Field';

export const ForgotPasswordForm = withQueryClient(function ForgotPasswordForm() {
	const request = useRequestPasswordReset();
	const [email, setEmail] = useTypedState('Reset the password', 'email', '');
	const [error, setError] = useState<string | undefined>();
	const [sent, setSent] = useState(false);

	async function submit(event: React.FormEvent) {
		event.preventDefault();
		const parsed = passwordResetRequestSchema.safeParse({ email });
		if (!parsed.success) return setError(fieldErrors(parsed.error).email);
		setError(undefined);
		try {
			await request.mutateAsync(parsed.data);
			setSent(true);
		} catch (e) {
			setError(e instanceof ApiError ? e.message : 'Could not reach the server.');
		}
	}

	if (sent)
		return (
			<FormMessage tone="ok">
				If {email} has an account, a reset link is on its way. It works once, for one hour.
			</FormMessage>
		);
	return (
		<form
			onSubmit={submit}
			noValidate
			className="flex flex-col gap-4"
			aria-label="Reset the password"
		>
			<Field
				label="E-mail"
				type="email"
				name="email"
				autoComplete="email"
				value={email}
				onChange={(e) => setEmail(e.target.value)}
				error={error}
				required
			/>
			<Button type="submit" busy={request.isPending}>
				Send a reset link
			</Button>
		</form>
	);
});

export const ResetPasswordForm = withQueryClient(function ResetPasswordForm({
	token,
}: {
	token: string;
}) {
	const confirm = useConfirmPasswordReset();
	const [password, setPassword] = useTypedState('Choose a new password', 'password', '');
	const [error, setError] = useState<string | undefined>();
	const [message, setMessage] = useState<{ tone: 'error' | 'ok'; text: string } | null>(null);

	async function submit(event: React.FormEvent) {
		event.preventDefault();
		const parsed = passwordResetConfirmSchema.safeParse({ token, password });
		if (!parsed.success)
			return setError(fieldErrors(parsed.error).password ?? fieldErrors(parsed.error).token);
		setError(undefined);
		try {
			await confirm.mutateAsync(parsed.data);
			setMessage({ tone: 'ok', text: 'Your password is changed. Sign in with the new one.' });
		} catch (e) {
			setMessage({
				tone: 'error',
				text: e instanceof ApiError ? e.message : 'Could not reach the server.',
			});
		}
	}

	return (
		<form
			onSubmit={submit}
			noValidate
			className="flex flex-col gap-4"
			aria-label="Choose a new password"
		>
			<Field
				label="New password"
				type="password"
				name="password"
				autoComplete="new-password"
				value={password}
				onChange={(e) => setPassword(e.target.value)}
				error={error}
				hint="At least 10 characters"
				required
			/>
			{message && (
				<FormMessage tone={message.tone}>
					{message.text}{' '}
					{message.tone === 'ok' && (
						<a href="/sign-in" className="font-semibold underline">
							Sign in
						</a>
					)}
				</FormMessage>
			)}
			<Button type="submit" busy={confirm.isPending} disabled={message?.tone === 'ok'}>
				Set the new password
			</Button>
		</form>
	);
});
