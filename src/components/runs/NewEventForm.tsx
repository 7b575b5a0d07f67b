import { useState } from 'react';
import { newEventSchema } from '@/lib/schemas/events';
import { ApiError } from '@/lib/client/api-client';
import { useCreateEvent } from '@/lib/client/queries/events';
import { withQueryClient } from '@/lib/client/query-client';
import { fieldErrors } from '@/lib/client/form-errors';
import { Button, Field } from '@/components/ui/Field';

export const NewEventForm = withQueryClient(function NewEventForm({ teamId }: { teamId: string }) {
	const create = useCreateEvent(teamId);
	const [values, setValues] = useState({
		name: '',
		startsOn: '',
		endsOn: '',
		place: '',
		format: '',
	});
	const [errors, setErrors] = useState<Record<string, string>>({});
	const set = (k: keyof typeof values) => (e: React.ChangeEvent<HTMLInputElement>) =>
		setValues((v) => ({
			...v,
			[k]: e.target.value,
			...(k === 'startsOn' && !v.endsOn ? { endsOn: e.target.value } : {}),
		}));
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
			<Field label="Event" value={values.name} onChange={set('name')} error={errors.name} />
			<Field
				label="From"
				type="date"
				value={values.startsOn}
				onChange={set('startsOn')}
				error={errors.startsOn}
			/>
			<Field
				label="To"
				type="date"
				value={values.endsOn}
				onChange={set('endsOn')}
				error={errors.endsOn}
			/>
			<Field label="Place" value={values.place} onChange={set('place')} error={errors.place} />
			<Field
				label="Format or class"
				value={values.format}
				onChange={set('format')}
				error={errors.format}
			/>
			<Button type="submit" busy={create.isPending || create.isSuccess}>
				Add the event
			</Button>
		</form>
	);
});
