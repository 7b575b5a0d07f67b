import {
	bankThevenin,
	type BuildDocument,
	type CalibrationParameter,
	type Sample,
} from '@/engine/browser';

/**
 * Whether the engine ran during a logged run, read from where the log rests: the mean voltage of
 * the samples at the lowest tenth of the logged current. A bank at rest cannot sit above its own
 * open-circuit voltage when full, so resting above the highest full-charge voltage of the banks
 * (or within 0.4 V of the lowest regulator set point) means the alternators were charging: the
 * engine ran. Otherwise the banks alone carried it (engine off). The member can correct it: the
 * log carries no engine speed.
 */
export function engineSpeedGuess(
	doc: BuildDocument,
	samples: readonly Sample[],
): { rpm: number; why: string } {
	if (doc.alternators.length === 0 || samples.length === 0)
		return { rpm: 0, why: 'Taken as engine off: the revision has no alternator.' };
	const setPointV = Math.min(...doc.alternators.map((a) => a.setPointV));
	const fullV = Math.max(0, ...doc.banks.map((b) => bankThevenin(b, 1).ocvV));
	const byAmps = [...samples].sort((a, b) => a.amps - b.amps);
	const quiet = byAmps.slice(0, Math.max(1, Math.ceil(byAmps.length / 10)));
	const restV = quiet.reduce((t, s) => t + s.volts, 0) / quiet.length;
	const v = (x: number) => `${x.toFixed(2)} V`;
	if (restV >= setPointV - 0.4 || (doc.banks.length > 0 && restV > fullV + 0.05))
		return {
			rpm: 1500,
			why: `The log rests at ${v(restV)}, above what the banks hold on their own (${v(fullV)} full): the engine was running. Give its speed during the run.`,
		};
	return {
		rpm: 0,
		why: `The log rests at ${v(restV)}, below the regulator's ${v(setPointV)}: taken as engine off. Give the speed if the engine ran.`,
	};
}

/**
 * The values fitted by default: the banks' resistance and charge (a log rests wherever the banks
 * happen to be), and with the engine running the alternators' output too; with it off the
 * alternators give nothing for the log to show.
 */
export function defaultCalibrationFit(engineRpm: number): CalibrationParameter[] {
	return engineRpm > 0
		? ['bankResistance', 'bankCharge', 'alternatorOutput']
		: ['bankResistance', 'bankCharge'];
}
