import { CALIBRATION_PARAMETERS, calibrateFromRun as calibrateFromRunUnchecked } from './calibrate';
import { assertEngineInput, EngineInputError } from './guard';

export { applyCalibration, CALIBRATION_PARAMETERS, loggedVoltageModel } from './calibrate';

/** Logs longer than this are thinned by the caller first; a fit never needs more. */
const MAX_CALIBRATION_SAMPLES = 500_000;
export const calibrateFromRun: typeof calibrateFromRunUnchecked = (doc, samples, options) => {
	assertEngineInput(doc, { calibration: options });
	if (!Array.isArray(samples) || samples.length > MAX_CALIBRATION_SAMPLES)
		throw new EngineInputError([
			{ path: 'samples', message: `Give up to ${MAX_CALIBRATION_SAMPLES} samples` },
		]);
	const fits: readonly string[] = CALIBRATION_PARAMETERS;
	if (!Array.isArray(options.fit) || options.fit.some((f) => !fits.includes(f)))
		throw new EngineInputError([
			{ path: 'calibration.fit', message: `Fit any of ${fits.join(', ')}` },
		]);
	return calibrateFromRunUnchecked(doc, samples, options);
};
