import { useState } from 'react';
import { newEventSchema } from '@/lib/schemas/events';
import { ApiError } from '@/lib/client/api-client';
import { useCreateEvent } from '@/lib/client/queries/events';
import { withQueryClient } from '@/lib/client/query-client';
import { fieldErrors } from '@/lib/client/form-errors';
import { Button, Field } from '@/components/ui/Field';
import { useTypedState } from '@/lib/client/typed-before-hydration';

export const NewEventForm = withQueryClient(function NewEventForm({ teamId }: { teamId: string }) {
	const create = useCreateEvent(teamId);
	// Each field starts from what was typed before the island woke (client:visible can wake it
	// while someone is already typing), so nothing typed is lost to hydration.
	const FORM = 'Add an event';
	const [name, setName] = useTypedState(FORM, 'name', '');
	const [startsOn, setStartsOn] = useTypedState(FORM, 'startsOn', '');
	const [endsOn, setEndsOn] = useTypedState(FORM, 'endsOn', '');
	const [place, setPlace] = useTypedState(FORM, 'place', '');
	const [format, setFormat] = useTypedState(FORM, 'format', '');
	const values = { name, startsOn, endsOn, place, format };
	const [errors, setErrors] = useState<Record<string, string>>({});
	const on =
		(set: (v: string) => void) =>
		(e: React.ChangeEvent<HTMLInputElement>): void =>
			set(e.target.value);
	return (
		<form
			noValidate
			aria-label="Add an event"
			className="flex flex-wrap items-end gap-3 rounded-md border border-hairline bg-card p-4"
			onSubmit={async (e) => {
				e.preventDefault();
				const parsed = newEventSchema.safeParse(values);
				if (!parsed.success) return setErrors(fieldErrors(parsed.error));
				try {
					await create.mutateAsync(parsed.data);
					window.location.reload();
				} catch (err) {
					setErrors(
						err instanceof ApiError
							? { name: err.message, ...err.byField() }
							: { name: 'Could not reach the server' },
					);
				}
			}}
		>
			<Field label="Event" name="name" value={name} onChange={on(setName)} error={errors.name} />
			<Field
				label="From"
				name="startsOn"
				type="date"
				value={startsOn}
				onChange={on(setStartsOn)}
				// A one-day event ends when it starts: To follows From once From is complete and left
				// (while its year is being typed, From passes through years like 0002).
				onBlur={() => {
					if (!endsOn && /^\d{4}-\d{2}-\d{2}$/.test(startsOn) && startsOn >= '1900')
						setEndsOn(startsOn);
				}}
				error={errors.startsOn}
			/>
			<Field
				label="To"
				name="endsOn"
				type="date"
				value={endsOn}
				onChange={on(setEndsOn)}
				error={errors.endsOn}
			/>
			<Field
				label="Place"
				name="place"
				value={place}
				onChange={on(setPlace)}
				error={errors.place}
			/>
			<Field
				label="Format or class"
				name="format"
				value={format}
				onChange={on(setFormat)}
				error={errors.format}
			/>
			<Button type="submit" busy={create.isPending || create.isSuccess}>
				Add the event
			</Button>
		</form>
	);
});
