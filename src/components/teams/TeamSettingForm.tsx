import { useState } from 'react';
import { ApiError } from '@/lib/client/api-client';
import { useUpdateTeam } from '@/lib/client/queries/teams';
import { Button, Field } from '@/components/ui/Field';

export function CurrencySection({ teamId, initial }: { teamId: string; initial: string }) {
	return (
		<TeamSettingForm
			teamId={teamId}
			id="currency"
			title="Plan prices"
			description="The currency plan parts are priced in. Changing it relabels the prices; it does not convert them."
			label="Currency code"
			hint="Three letters, e.g. USD, EUR, GBP"
			initial={initial}
			maxLength={3}
			field="currency"
			toBody={(v) => ({ currency: v })}
			saved={(v) => `Plan prices are in ${v.trim().toUpperCase()}.`}
		/>
	);
}

export function ReminderSection({ teamId, initialDays }: { teamId: string; initialDays: number }) {
	return (
		<TeamSettingForm
			teamId={teamId}
			id="reminder"
			title="Event reminders"
			label="Days before an event"
			inputMode="numeric"
			initial={String(initialDays)}
			field="reminderDays"
			toBody={(v) => ({ reminderDays: Number(v) })}
			saved={(v) => `Members get a reminder ${v} days before each event.`}
		/>
	);
}

/** One team setting: a field, a save button, the server's verdict beside it. */

export function TeamSettingForm(p: {
	teamId: string;
	id: string;
	title: string;
	description?: string;
	label: string;
	hint?: string;
	initial: string;
	maxLength?: number;
	inputMode?: 'numeric';
	field: string;
	toBody: (value: string) => { currency?: string; reminderDays?: number };
	saved: (value: string) => string;
}) {
	const [value, setValue] = useState(p.initial);
	const update = useUpdateTeam(p.teamId);
	const [note, setNote] = useState<string | null>(null);
	const error =
		update.error instanceof ApiError
			? (update.error.byField()[p.field] ?? update.error.message)
			: update.error
				? 'Could not save'
				: undefined;
	return (
		<section aria-labelledby={`${p.id}-heading`}>
			<h2 id={`${p.id}-heading`} className="text-xl font-bold">
				{p.title}
			</h2>
			{p.description && <p className="text-sm text-ink-soft">{p.description}</p>}
			<form
				noValidate
				className="mt-3 flex flex-wrap items-end gap-3"
				onSubmit={(e) => {
					e.preventDefault();
					setNote(null);
					update.mutate(p.toBody(value), { onSuccess: () => setNote(p.saved(value)) });
				}}
			>
				<Field
					label={p.label}
					inputMode={p.inputMode}
					maxLength={p.maxLength}
					value={value}
					onChange={(e) => setValue(e.target.value)}
					error={error}
					hint={p.hint}
					className="w-48"
				/>
				<Button type="submit" variant="secondary" busy={update.isPending}>
					Save
				</Button>
				{note && (
					<span role="status" className="text-sm text-teal">
						✓ {note}
					</span>
				)}
			</form>
		</section>
	);
}
