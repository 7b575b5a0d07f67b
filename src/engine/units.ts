/** Display units. The engine is SI inside; the interface shows feet/AWG or metres/mm² per preference. */
export type UnitSystem = 'imperial' | 'metric';

export const M_PER_FT = 0.3048;
export const M_PER_IN = 0.0254;

export const metresToFeet = (m: number): number => m / M_PER_FT;
export const feetToMetres = (ft: number): number => ft * M_PER_FT;

/** A length for display: feet with one decimal, or metres with two. */
export function formatLength(m: number, units: UnitSystem): string {
	return units === 'imperial' ? `${metresToFeet(m).toFixed(1)} ft` : `${m.toFixed(2)} m`;
}

/** A short distance for display (a fuse from its battery): whole inches or whole centimetres. */
export function formatShortDistance(m: number, units: UnitSystem): string {
	return units === 'imperial' ? `${Math.round(m / M_PER_IN)} in` : `${Math.round(m * 100)} cm`;
}
