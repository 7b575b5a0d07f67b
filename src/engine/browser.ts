/**
 * The engine for islands: every model and computation, unchecked, and no schema library. The build
 * page checks a draft with the document's schema (`documentProblems`, `buildDocumentSchema` from
 * `@/engine`, loaded on the first touch of the editor) before it asks for figures; everything else
 * imports the checked index, `@/engine`, which re-exports this.
 */
export * from './types';
export * from './part-kinds';
export * from './conductors';
export * from './amplifier';
export * from './battery';
export * from './alternator';
export * from './fuses';
export * from './topology';
export { solveCompiled } from './solver';
export {
	compileNetwork,
	conducts,
	GMIN_S,
	type SolveConditions,
	type CompiledNetwork,
} from './network';
export * from './solve';
export * from './budget';
export * from './burp';
export * from './session';
export * from './report';
export * from './spice';
export * from './units';
export * from './diff';
export * from './hints';
export * from './run-analysis';
export * from './checks';
export * from './headline';
export * from './findings';
export * from './heating';
export * from './sweep';
export * from './compare';
export * from './merge';
export * from './defaults';
export { describeFeed, type FeedReference, type FeedShare } from './feed';
// The calibration fit is its own entry, `@/engine/calibration` (it brings a fitting library that
// pages without a log should not load); only its types are here.
export type {
	CalibrationOptions,
	CalibrationParameter,
	CalibrationPoint,
	CalibrationResult,
	FittedParameter,
} from './calibrate';
export { EngineInputError, type EngineProblem } from './errors';
export * from './text-rules';
