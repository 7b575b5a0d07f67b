export * from './types';
export * from './conductors';
export * from './amplifier';
export * from './battery';
export * from './alternator';
export * from './fuses';
export * from './topology';
export {
	compileNetwork,
	solveCompiled,
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
export * from './heating';
export * from './sweep';
export * from './compare';
export * from './merge';
export * from './defaults';
