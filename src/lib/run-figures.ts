import type { RunDto } from '@/lib/schemas/runs';

/** The voltages a run records both typed and, where a logger file is attached, from the file. */
export type LoggedVoltage = 'restingV' | 'minV';

/**
 * A run's voltage as every view reads it (table, charts, comparison, CSV, team page): the logger
 * file's own figure where the run has one, otherwise the typed one. `typed` is the typed figure
 * when it differs from the one shown (so a view can put it beside), else null.
 */
export function runVoltage(
	run: Pick<RunDto, LoggedVoltage | 'logger'>,
	field: LoggedVoltage,
): { value: number | null; fromLogger: boolean; typed: number | null } {
	const logged = run.logger ? run.logger[field] : null;
	if (logged === null) return { value: run[field], fromLogger: false, typed: null };
	const typed = run[field];
	return {
		value: logged,
		fromLogger: true,
		typed: typed !== null && Math.abs(typed - logged) >= 0.005 ? typed : null,
	};
}
