import { useState } from 'react';
import { updateVehicleSchema } from '@/lib/schemas/vehicles';
import { ApiError } from '@/lib/client/api-client';
import { useUpdateVehicle } from '@/lib/client/queries/builds';
import { withQueryClient } from '@/lib/client/query-client';
import { fieldErrors } from '@/lib/client/form-errors';
import type { VehicleDto } from '@/lib/schemas/vehicles';
import { Button, Field, FormMessage } from '@/components/ui/Field';

export interface VehicleDetailsFormProps {
	teamId: string;
	vehicle: VehicleDto;
	members: Array<{ userId: string; name: string | null; email: string }>;
}

/** Name, description, class, notes and owner of a vehicle; archiving keeps its history readable. */
export const VehicleDetailsForm = withQueryClient(function VehicleDetailsForm({
	teamId,
	vehicle,
	members,
}: VehicleDetailsFormProps) {
	const update = useUpdateVehicle(teamId, vehicle.id);
	const [open, setOpen] = useState(false);
	const [values, setValues] = useState({
		name: vehicle.name,
		description: vehicle.description,
		competitionClass: vehicle.competitionClass,
		notes: vehicle.notes,
		ownerId: vehicle.ownerId,
	});
	const [errors, setErrors] = useState<Record<string, string>>({});
	const [state, setState] = useState<{ message: string | null; tone: 'ok' | 'error' }>({
		message: null,
		tone: 'ok',
	});

	async function patch(body: Parameters<typeof update.mutateAsync>[0], reload = false) {
		setState({ message: null, tone: 'ok' });
		try {
			await update.mutateAsync(body);
			if (reload) window.location.reload();
			else setState({ message: 'Saved.', tone: 'ok' });
		} catch (e) {
			if (e instanceof ApiError) setErrors(e.byField());
			setState({
				message: e instanceof ApiError ? e.message : 'Could not reach the server.',
				tone: 'error',
			});
		}
	}

	if (!open) {
		return (
			<button
				type="button"
				onClick={() => setOpen(true)}
				className="rounded-md border border-hairline bg-card px-3 py-1.5 text-sm font-semibold hover:border-copper"
			>
				Vehicle details
			</button>
		);
	}
	const set =
		(k: 'name' | 'description' | 'competitionClass' | 'notes') =>
		(e: React.ChangeEvent<HTMLInputElement>) =>
			setValues((v) => ({ ...v, [k]: e.target.value }));
	return (
		<form
			noValidate
			aria-label="Vehicle details"
			className="mt-3 flex flex-col gap-3 rounded-md border border-hairline bg-card p-4"
			onSubmit={(e) => {
				e.preventDefault();
				const parsed = updateVehicleSchema.safeParse(values);
				if (!parsed.success) return setErrors(fieldErrors(parsed.error));
				setErrors({});
				void patch(parsed.data);
			}}
		>
			<div className="grid gap-3 md:grid-cols-2">
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
				<div className="flex flex-col gap-1">
					<label htmlFor="vehicle-owner" className="text-sm font-semibold">
						Owner
					</label>
					<select
						id="vehicle-owner"
						value={values.ownerId ?? ''}
						onChange={(e) => setValues((v) => ({ ...v, ownerId: e.target.value || null }))}
						className="rounded-md border border-hairline bg-card px-3 py-2"
					>
						<option value="">nobody in particular</option>
						{members.map((m) => (
							<option key={m.userId} value={m.userId}>
								{m.name ?? m.email}
							</option>
						))}
					</select>
					{errors.ownerId && <p className="text-sm text-brick">✕ {errors.ownerId}</p>}
				</div>
			</div>
			<Field label="Notes" value={values.notes} onChange={set('notes')} error={errors.notes} />
			<div className="flex flex-wrap items-center gap-3">
				<Button type="submit" busy={update.isPending}>
					Save details
				</Button>
				<Button
					type="button"
					variant="secondary"
					onClick={() => void patch({ archived: !vehicle.archived }, true)}
				>
					{vehicle.archived ? 'Bring back from the archive' : 'Archive the vehicle'}
				</Button>
				<Button type="button" variant="secondary" onClick={() => setOpen(false)}>
					Close
				</Button>
			</div>
			{state.message && <FormMessage tone={state.tone}>{state.message}</FormMessage>}
		</form>
	);
});
