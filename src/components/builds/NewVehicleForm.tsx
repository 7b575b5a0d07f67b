import { useState } from 'react';
import { newVehicleSchema } from '@/lib/schemas/vehicles';
import { ApiError, postJson } from '@/lib/client/api-client';
import { fieldErrors } from '@/lib/client/form-errors';
import { Button, Field } from '../ui/Field';

export function NewVehicleForm({ teamId }: { teamId: string }) {
	const [open, setOpen] = useState(false);
	const [values, setValues] = useState({ name: '', description: '', competitionClass: '' });
	const [errors, setErrors] = useState<Record<string, string>>({});
	const [busy, setBusy] = useState(false);
	if (!open)
		return (
			<Button variant="secondary" onClick={() => setOpen(true)}>
				+ Add a vehicle
			</Button>
		);
	const set = (k: keyof typeof values) => (e: React.ChangeEvent<HTMLInputElement>) => setValues((v) => ({ ...v, [k]: e.target.value }));
	return (
		<form
			noValidate
			aria-label="Add a vehicle"
			className="flex flex-wrap items-end gap-3 rounded-md border border-hairline bg-card p-4"
			onSubmit={async (e) => {
				e.preventDefault();
				const parsed = newVehicleSchema.safeParse(values);
				if (!parsed.success) return setErrors(fieldErrors(parsed.error));
				setBusy(true);
				try {
					const v = await postJson<{ id: string }>(`/api/teams/${teamId}/vehicles`, parsed.data);
					window.location.href = `/teams/${teamId}/vehicles/${v.id}`;
				} catch (err) {
					setErrors(err instanceof ApiError ? { name: err.message, ...err.byField() } : { name: 'Could not reach the server' });
					setBusy(false);
				}
			}}
		>
			<Field label="Name" value={values.name} onChange={set('name')} error={errors.name} />
			<Field label="Year, make and model" value={values.description} onChange={set('description')} error={errors.description} />
			<Field label="Competition class" value={values.competitionClass} onChange={set('competitionClass')} error={errors.competitionClass} />
			<Button type="submit" busy={busy}>
				Add the vehicle
			</Button>
		</form>
	);
}
