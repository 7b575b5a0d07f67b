import { useState } from 'react';
import { newVehicleSchema } from '@/lib/schemas/vehicles';
import { ApiError } from '@/lib/client/api-client';
import { useCreateVehicle } from '@/lib/client/queries/builds';
import { withQueryClient } from '@/lib/client/query-client';
import { fieldErrors } from '@/lib/client/form-errors';
import { Button, Field } from '@/components/ui/Field';

export const NewVehicleForm = withQueryClient(function NewVehicleForm({
	teamId,
}: {
	teamId: string;
}) {
	const create = useCreateVehicle(teamId);
	const [open, setOpen] = useState(false);
	const [values, setValues] = useState({ name: '', description: '', competitionClass: '' });
	const [errors, setErrors] = useState<Record<string, string>>({});
	if (!open)
		return (
			<Button variant="secondary" onClick={() => setOpen(true)}>
				+ Add a vehicle
			</Button>
		);
	const set = (k: keyof typeof values) => (e: React.ChangeEvent<HTMLInputElement>) =>
		setValues((v) => ({ ...v, [k]: e.target.value }));
	return (
		<form
			noValidate
			aria-label="Add a vehicle"
			className="flex flex-wrap items-end gap-3 rounded-md border border-hairline bg-card p-4"
			onSubmit={async (e) => {
				e.preventDefault();
				const parsed = newVehicleSchema.safeParse(values);
				if (!parsed.success) return setErrors(fieldErrors(parsed.error));
				try {
					const v = await create.mutateAsync(parsed.data);
					window.location.href = `/teams/${teamId}/vehicles/${v.id}`;
				} catch (err) {
					setErrors(
						err instanceof ApiError
							? { name: err.message, ...err.byField() }
							: { name: 'Could not reach the server' },
					);
				}
			}}
		>
			<Field label="Name" value={values.name} onChange={set('name')} error={errors.name} />
			<Field
				label="Year, make and model"
				value={values.description}
				onChange={set('description')}
				error={errors.description}
			/>
			<Field
				label="Competition class"
				value={values.competitionClass}
				onChange={set('competitionClass')}
				error={errors.competitionClass}
			/>
			<Button type="submit" busy={create.isPending || create.isSuccess}>
				Add the vehicle
			</Button>
		</form>
	);
});
