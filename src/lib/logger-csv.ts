import Papa from 'papaparse';
import type { Sample } from '@/engine/browser';

export interface ColumnMapping {
	time: string;
	volts: string;
	amps: string;
	/** Unit of the time column. */
	timeUnit: 's' | 'ms';
}

export const MAX_LOGGER_BYTES = 5 * 1024 * 1024;
export const MAX_LOGGER_ROWS = 200_000;

export type ParseResult =
	| { ok: true; samples: Sample[]; columns: string[] }
	| { ok: false; row: number | null; message: string };

/** The header of a logger file, to offer its columns for mapping. */
export function loggerColumns(text: string): string[] {
	const first = Papa.parse<string[]>(text, { preview: 1, skipEmptyLines: true });
	return (first.data[0] ?? []).map((c) => c.trim()).filter(Boolean);
}

/**
 * Reads a logger CSV (a header row, then one sample a row) with the columns mapped by the user.
 * Refuses, naming the row (1 = the header) and the reason: an empty file, a mapped column that is
 * missing, a cell that is not a number, time going backwards, fewer than two samples, too many rows.
 */
export function parseLoggerCsv(text: string, mapping: ColumnMapping): ParseResult {
	if (text.trim() === '') return { ok: false, row: null, message: 'The file is empty.' };
	const parsed = Papa.parse<Record<string, string>>(text, {
		header: true,
		skipEmptyLines: true,
		transformHeader: (h) => h.trim(),
	});
	const columns = parsed.meta.fields ?? [];
	for (const [role, name] of [
		['time', mapping.time],
		['voltage', mapping.volts],
		['current', mapping.amps],
	] as const) {
		if (!columns.includes(name))
			return {
				ok: false,
				row: 1,
				message: `The ${role} column "${name}" is not in the file (it has: ${columns.join(', ') || 'no columns'}).`,
			};
	}
	if (parsed.data.length > MAX_LOGGER_ROWS)
		return {
			ok: false,
			row: null,
			message: `The file has ${parsed.data.length} rows; the limit is ${MAX_LOGGER_ROWS}.`,
		};
	const samples: Sample[] = [];
	for (const [i, row] of parsed.data.entries()) {
		const line = i + 2;
		const values: number[] = [];
		for (const name of [mapping.time, mapping.volts, mapping.amps]) {
			const raw = (row[name] ?? '').trim();
			const value = raw === '' ? Number.NaN : Number(raw);
			if (!Number.isFinite(value))
				return {
					ok: false,
					row: line,
					message: `Row ${line}: column "${name}" holds "${raw}", not a number.`,
				};
			values.push(value);
		}
		const tS = mapping.timeUnit === 'ms' ? values[0]! / 1000 : values[0]!;
		const prev = samples.at(-1);
		if (prev && tS < prev.tS)
			return {
				ok: false,
				row: line,
				message: `Row ${line}: time goes backwards (${tS} s after ${prev.tS} s).`,
			};
		samples.push({ tS, volts: values[1]!, amps: values[2]! });
	}
	if (samples.length < 2)
		return { ok: false, row: null, message: 'The file needs at least two samples.' };
	return { ok: true, samples, columns };
}
