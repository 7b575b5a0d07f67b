import { type InputHTMLAttributes, useId } from 'react';

interface FieldProps extends InputHTMLAttributes<HTMLInputElement> {
	label: string;
	error?: string;
	hint?: string;
}

/** A labelled input with its error beside it (announced to screen readers). */
export function Field({ label, error, hint, className = '', ...input }: FieldProps) {
	const id = useId();
	const describedBy =
		[error ? `${id}-error` : '', hint ? `${id}-hint` : ''].filter(Boolean).join(' ') || undefined;
	return (
		<div className={`flex flex-col gap-1 ${className}`}>
			<label htmlFor={id} className="text-sm font-semibold">
				{label}
			</label>
			<input
				id={id}
				aria-invalid={error ? true : undefined}
				aria-describedby={describedBy}
				className={`rounded-md border bg-card px-3 py-2 text-base shadow-sm outline-none focus:border-copper focus:ring-2 focus:ring-copper/30 ${error ? 'border-brick' : 'border-hairline'}`}
				{...input}
			/>
			{hint && !error && (
				<p id={`${id}-hint`} className="text-sm text-ink-soft">
					{hint}
				</p>
			)}
			{error && (
				<p id={`${id}-error`} role="alert" className="flex items-center gap-1 text-sm text-brick">
					<span aria-hidden="true">✕</span> {error}
				</p>
			)}
		</div>
	);
}

export function FormMessage({
	tone,
	children,
}: {
	tone: 'error' | 'ok' | 'info';
	children: React.ReactNode;
}) {
	const styles = {
		error: 'border-brick/40 bg-brick-tint text-brick',
		ok: 'border-teal/40 bg-teal-tint text-teal',
		info: 'border-hairline bg-paper text-ink',
	}[tone];
	const icon = { error: '⚠', ok: '✓', info: 'ℹ' }[tone];
	return (
		<p
			role={tone === 'error' ? 'alert' : 'status'}
			className={`flex items-start gap-2 rounded-md border px-3 py-2 text-sm ${styles}`}
		>
			<span aria-hidden="true">{icon}</span>
			<span>{children}</span>
		</p>
	);
}

export function Button({
	children,
	variant = 'primary',
	busy,
	className = '',
	...rest
}: React.ButtonHTMLAttributes<HTMLButtonElement> & {
	variant?: 'primary' | 'secondary' | 'danger';
	busy?: boolean;
}) {
	const styles = {
		primary: 'bg-copper-deep text-white hover:bg-copper-dark',
		secondary: 'border border-hairline bg-card text-ink hover:border-copper',
		danger: 'bg-brick text-white hover:bg-brick/90',
	}[variant];
	return (
		<button
			className={`inline-flex shrink-0 items-center justify-center gap-2 rounded-md px-4 py-2 font-semibold whitespace-nowrap disabled:opacity-60 ${styles} ${className}`}
			disabled={busy || rest.disabled}
			aria-busy={busy || undefined}
			{...rest}
		>
			{busy && (
				<span
					aria-hidden="true"
					className="size-3 animate-spin rounded-full border-2 border-current border-t-transparent"
				/>
			)}
			{children}
		</button>
	);
}
