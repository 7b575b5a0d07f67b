import { useState } from 'react';
import { useTypedState } from '@/lib/client/typed-before-hydration';
import { emailSchema, signInSchema } from '@/lib/schemas/account';
import { requestSignInLink, signInWithPassword } from '@/lib/client/auth-client';
import { fieldErrors } from '@/lib/client/form-errors';
import { Button, Field, FormMessage } from '@/components/ui/Field';

export interface SignInFormProps {
	callbackUrl: string;
	initialError?: string | null;
}

/** E-mail + password, or a one-time link by e-mail. */
export function SignInForm({ callbackUrl, initialError }: SignInFormProps) {
	const [mode, setMode] = useState<'password' | 'link'>('password');
	const [email, setEmail] = useTypedState('Sign in', 'email', '');
	const [password, setPassword] = useTypedState('Sign in', 'password', '');
	const [errors, setErrors] = useState<Record<string, string>>({});
	const [message, setMessage] = useState<{ tone: 'error' | 'ok'; text: string } | null>(
		initialError ? { tone: 'error', text: initialError } : null,
	);
	const [busy, setBusy] = useState(false);

	async function submit(event: React.FormEvent) {
		event.preventDefault();
		setMessage(null);
		if (mode === 'password') {
			const parsed = signInSchema.safeParse({ email, password });
			if (!parsed.success) return setErrors(fieldErrors(parsed.error));
			setErrors({});
			setBusy(true);
			const outcome = await signInWithPassword(
				parsed.data.email,
				parsed.data.password,
				callbackUrl,
			);
			setBusy(false);
			if (outcome.ok) window.location.href = outcome.url;
			else setMessage({ tone: 'error', text: outcome.message });
		} else {
			const parsed = emailSchema.safeParse(email);
			if (!parsed.success) return setErrors({ email: parsed.error.issues[0]!.message });
			setErrors({});
			setBusy(true);
			const outcome = await requestSignInLink(parsed.data, callbackUrl);
			setBusy(false);
			if (outcome.ok)
				setMessage({
					tone: 'ok',
					text: `A sign-in link is on its way to ${parsed.data}. It works once, for 24 hours.`,
				});
			else setMessage({ tone: 'error', text: outcome.message });
		}
	}

	return (
		<form
			method="post"
			onSubmit={submit}
			noValidate
			className="flex flex-col gap-4"
			aria-label="Sign in"
		>
			<input type="hidden" name="mode" value={mode} />
			<div
				role="radiogroup"
				aria-label="How to sign in"
				className="grid grid-cols-2 gap-1 rounded-md border border-hairline bg-paper p-1 text-sm"
			>
				{(['password', 'link'] as const).map((m) => (
					<button
						key={m}
						type="button"
						role="radio"
						aria-checked={mode === m}
						onClick={() => setMode(m)}
						className={`rounded px-3 py-1.5 font-semibold ${mode === m ? 'bg-card shadow-sm' : 'text-ink-soft'}`}
					>
						{m === 'password' ? 'Password' : 'E-mail me a link'}
					</button>
				))}
			</div>
			<Field
				label="E-mail"
				name="email"
				type="email"
				autoComplete="email"
				value={email}
				onChange={(e) => setEmail(e.target.value)}
				error={errors.email}
				required
			/>
			{mode === 'password' && (
				<Field
					label="Password"
					name="password"
					type="password"
					autoComplete="current-password"
					value={password}
					onChange={(e) => setPassword(e.target.value)}
					error={errors.password}
					required
				/>
			)}
			{message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
			<Button type="submit" busy={busy}>
				{mode === 'password' ? 'Sign in' : 'Send the link'}
			</Button>
		</form>
	);
}
