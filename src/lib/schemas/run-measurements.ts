import { z } from '@/lib/zod';

/**
 * What a run measured: the one definition. The run table's columns, the API's fields and their
 * bounds, the backup format, the CSV export and both run forms are all read from this list, so
 * adding a measurement is one entry here plus the migration that adds its column.
 */
export const RUN_MEASUREMENTS = {
	scoreDb: {
		column: 'score_db',
		label: 'Score',
		short: 'Score',
		unit: 'dB',
		min: 0,
		max: 200,
		decimals: 1,
	},
	frequencyHz: {
		column: 'frequency_hz',
		label: 'Frequency',
		short: 'Frequency',
		unit: 'Hz',
		min: 1,
		max: 20000,
		decimals: 0,
	},
	restingV: {
		column: 'resting_v',
		label: 'Resting voltage',
		short: 'Resting',
		unit: 'V',
		min: 0,
		max: 30,
		decimals: 2,
	},
	minV: {
		column: 'min_v',
		label: 'Minimum voltage',
		short: 'Minimum',
		unit: 'V',
		min: 0,
		max: 30,
		decimals: 2,
	},
	ambientC: {
		column: 'ambient_c',
		label: 'Ambient temperature',
		short: 'Ambient',
		unit: '°C',
		min: -40,
		max: 70,
		decimals: 0,
	},
} as const satisfies Record<string, MeasurementSpec>;

export interface MeasurementSpec {
	/** The run table's column (double precision, nullable). */
	column: string;
	label: string;
	/** A table column's heading. */
	short: string;
	unit: string;
	min: number;
	max: number;
	/** Decimals shown to people. */
	decimals: number;
}

export type MeasurementField = keyof typeof RUN_MEASUREMENTS;

export const MEASUREMENT_FIELDS = Object.keys(RUN_MEASUREMENTS) as MeasurementField[];

/** The measured numbers of a run, by field name (null when not measured). */
export type RunNumbers = { [K in MeasurementField]: number | null };
/** The same numbers by column name, as the run table holds them. */
export type RunNumberColumns = {
	[K in MeasurementField as (typeof RUN_MEASUREMENTS)[K]['column']]: number | null;
};

/** What a run measured, as the API and the backup file name it: the numbers and the notes. */
export type RunMeasurements = RunNumbers & { notes: string };

function measurementNumber(spec: MeasurementSpec) {
	const what = spec.label;
	return z
		.number({ error: `${what} must be a number` })
		.min(spec.min, `${what} from ${spec.min} ${spec.unit}`)
		.max(spec.max, `${what} up to ${spec.max} ${spec.unit}`)
		.nullable();
}

/** zod shape of the numbers (each optional-null with its bounds), for the API and the backup schemas. */
export const measurementNumbersShape = Object.fromEntries(
	MEASUREMENT_FIELDS.map((field) => [
		field,
		measurementNumber(RUN_MEASUREMENTS[field]).default(null),
	]),
) as { [K in MeasurementField]: z.ZodDefault<ReturnType<typeof measurementNumber>> };

/** The run table's columns for the measurements given (absent ones are left out, for partial updates). */
export function measurementColumns(
	m: Partial<RunMeasurements>,
): Partial<RunNumberColumns & { notes: string }> {
	const out: Record<string, unknown> = {};
	for (const field of MEASUREMENT_FIELDS)
		if (m[field] !== undefined) out[RUN_MEASUREMENTS[field].column] = m[field];
	if (m.notes !== undefined) out.notes = m.notes;
	return out as Partial<RunNumberColumns & { notes: string }>;
}

/** The measurements of a run table row. */
export function measurementsOf(row: RunNumberColumns & { notes: string }): RunMeasurements {
	const out: Record<string, unknown> = { notes: row.notes };
	for (const field of MEASUREMENT_FIELDS) out[field] = row[RUN_MEASUREMENTS[field].column];
	return out as RunMeasurements;
}

/** A form's text for each number (blank when not measured). */
export function measurementTexts(m?: Partial<RunNumbers>): Record<MeasurementField, string> {
	return Object.fromEntries(
		MEASUREMENT_FIELDS.map((f) => [f, m?.[f] == null ? '' : String(m[f])]),
	) as Record<MeasurementField, string>;
}

/** The numbers typed in a form: blank is null, anything else a number (the schema judges it). */
export function measurementsFromTexts(texts: Record<MeasurementField, string>): RunNumbers {
	return Object.fromEntries(
		MEASUREMENT_FIELDS.map((f) => [
			f,
			texts[f].trim() === '' ? null : Number(texts[f].replace(',', '.')),
		]),
	) as RunNumbers;
}
