import { useState } from 'react';
import { typedValue } from '@/lib/client/typed-before-hydration';

const FORM = 'Create an account';
import { signUpSchema } from '@/lib/schemas/account';
import { ApiError } from '@/lib/client/api-client';
import { useSignUp } from '@/lib/client/queries/account';
import { withQueryClient } from '@/lib/client/query-client';
import { signInWithPassword } from '@/lib/client/auth-client';
import { fieldErrors } from '@/lib/client/form-errors';
import { Button, Field, FormMessage } from '@/components/ui/Field';

export interface SignUpFormProps {
	callbackUrl: string;
	/** Prefilled (and fixed) when signing up from an invitation. */
	email?: string;
	/** What the server said about a form posted before the script ran. */
	initial?: {
		name?: string;
		email?: string;
		errors?: Record<string, string>;
		message?: string | null;
	};
}

export const SignUpForm = withQueryClient(function SignUpForm({
	callbackUrl,
	email: invitedEmail,
	initial,
}: SignUpFormProps) {
	const signUp = useSignUp();
	const [signingIn, setSigningIn] = useState(false);
	const [values, setValues] = useState(() => ({
		name: typedValue(FORM, 'name') ?? initial?.name ?? '',
		email: typedValue(FORM, 'email') ?? invitedEmail ?? initial?.email ?? '',
		password: typedValue(FORM, 'password') ?? '',
	}));
	const [errors, setErrors] = useState<Record<string, string>>(initial?.errors ?? {});
	const [message, setMessage] = useState<string | null>(initial?.message ?? null);
	const set = (key: keyof typeof values) => (e: React.ChangeEvent<HTMLInputElement>) =>
		setValues((v) => ({ ...v, [key]: e.target.value }));

	async function submit(event: React.FormEvent) {
		event.preventDefault();
		setMessage(null);
		const parsed = signUpSchema.safeParse(values);
		if (!parsed.success) return setErrors(fieldErrors(parsed.error));
		setErrors({});
		try {
			await signUp.mutateAsync(parsed.data);
			setSigningIn(true);
			const outcome = await signInWithPassword(
				parsed.data.email,
				parsed.data.password,
				callbackUrl,
			);
			if (outcome.ok) window.location.href = outcome.url;
			else {
				setSigningIn(false);
				setMessage(outcome.message);
			}
		} catch (error) {
			if (error instanceof ApiError) {
				setErrors(error.byField());
				setMessage(error.message);
			} else setMessage('Could not reach the server. Check the connection and try again.');
		}
	}

	return (
		<form
			method="post"
			onSubmit={submit}
			noValidate
			className="flex flex-col gap-4"
			aria-label={FORM}
		>
			<Field
				label="Your name"
				name="name"
				autoComplete="name"
				value={values.name}
				onChange={set('name')}
				error={errors.name}
				required
			/>
			<Field
				label="E-mail"
				name="email"
				type="email"
				autoComplete="email"
				value={values.email}
				onChange={set('email')}
				readOnly={Boolean(invitedEmail)}
				error={errors.email}
				hint={invitedEmail ? 'The address the invitation was sent to' : undefined}
				required
			/>
			<Field
				label="Password"
				name="password"
				type="password"
				autoComplete="new-password"
				value={values.password}
				onChange={set('password')}
				error={errors.password}
				hint="At least 10 characters"
				required
			/>
			{message && <FormMessage tone="error">{message}</FormMessage>}
			<Button type="submit" busy={signUp.isPending || signingIn}>
				Create the account
			</Button>
		</form>
	);
});
