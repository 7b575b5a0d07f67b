import type { Material } from './types';

/**
 * Adiabatic short-time heating of a conductor (IEC 60949, the adiabatic method): with no heat
 * leaving the conductor, I²·t = K²·S²·ln((θf + β)/(θi + β)), so
 *   θf = (θi + β)·exp(I²·t / (K²·S²)) − β.
 * K (A·s^½/mm²) and β (K) for copper 226 and 234.5, for aluminium 148 and 228, as IEC 60949
 * tabulates them (values from memory of the standard's table). Tinned copper takes copper's.
 * CCA takes aluminium's: it is 85–90 % aluminium by volume, so its heat capacity per volume and
 * its resistivity sit near aluminium's (an assumption, stated; no published constant for CCA).
 *
 * Ignoring the heat the insulation and air take away overstates the rise — more so the longer
 * the current flows — so over a burp of several seconds this is an upper bound, on the safe side.
 */
export const ADIABATIC_CONSTANTS: Record<Material, { K: number; beta: number }> = {
	copper: { K: 226, beta: 234.5 },
	tinned_copper: { K: 226, beta: 234.5 },
	cca10: { K: 148, beta: 228 },
	cca15: { K: 148, beta: 228 },
	aluminium: { K: 148, beta: 228 },
};

/**
 * The conductor temperature (°C) after `seconds` at `currentA` through `areaMm2` of metal (all
 * parallel runs together), starting from `initialC`, by the adiabatic relation above.
 */
export function adiabaticFinalC(
	material: Material,
	areaMm2: number,
	currentA: number,
	seconds: number,
	initialC: number,
): number {
	const { K, beta } = ADIABATIC_CONSTANTS[material];
	if (!(areaMm2 > 0) || !(seconds > 0)) return initialC;
	const exponent = (currentA * currentA * seconds) / (K * K * areaMm2 * areaMm2);
	// Past ~700 the exponential overflows: the cable would be far beyond any rating anyway.
	return (initialC + beta) * Math.exp(Math.min(exponent, 700)) - beta;
}
