import { Field } from '@/components/ui/Field';
import {
	MEASUREMENT_FIELDS,
	RUN_MEASUREMENTS,
	type MeasurementField,
} from '@/lib/schemas/run-measurements';

/** One field per run measurement, read from its one definition (label, unit, keyboard). */
export function MeasurementFields({
	values,
	errors,
	onChange,
	className,
}: {
	values: Record<MeasurementField, string>;
	errors: Record<string, string>;
	onChange: (field: MeasurementField, value: string) => void;
	className?: string;
}) {
	return (
		<>
			{MEASUREMENT_FIELDS.map((f) => (
				<Field
					key={f}
					label={`${RUN_MEASUREMENTS[f].label} (${RUN_MEASUREMENTS[f].unit})`}
					inputMode="decimal"
					value={values[f]}
					onChange={(e) => onChange(f, e.target.value)}
					error={errors[f]}
					className={className}
				/>
			))}
		</>
	);
}
