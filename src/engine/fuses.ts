/**
 * Standard fuse ratings a team can buy (A): blade (ISO 8820-3 Type C/F, up to 40 A, from memory),
 * maxi (Type E, 50–80 A, secondary source), and bolt-down strip / high-current fuses above
 * (ISO 8820-5 covers 30–500 A; the steps, and the non-ISO ratings above 500 A, are common
 * practice, no published source).
 */
export const STANDARD_FUSE_RATINGS_A = [
	1, 2, 3, 5, 7.5, 10, 15, 20, 25, 30, 40, 50, 60, 70, 80, 100, 125, 150, 175, 200, 225, 250, 300,
	350, 400, 500, 600, 750, 1000,
] as const;

/**
 * Largest overcurrent device allowed for a conductor in a circuit below 50 V: 150 % of its
 * allowable amperage (33 CFR 183.455(c)).
 */
export const MAX_FUSE_FACTOR = 1.5;

export type FuseAdvice =
	| { status: 'ok'; recommendedA: number; maxA: number }
	| { status: 'cable_too_small'; designCurrentA: number; maxA: number; message: string }
	| { status: 'unknown_capacity'; recommendedA: number | null; message: string };

/**
 * The smallest standard rating at or above the design current that does not exceed what the cable
 * may be protected with (1.5 × its allowable amperage). When none fits, the cable is too small for
 * the current it must carry.
 */
export function adviseFuse(designCurrentA: number, ampacityA: number | null): FuseAdvice {
	const recommended = STANDARD_FUSE_RATINGS_A.find((r) => r >= designCurrentA) ?? null;
	if (ampacityA === null) {
		return {
			status: 'unknown_capacity',
			recommendedA: recommended,
			message: 'No current capacity is known for this insulation rating.',
		};
	}
	const maxA = ampacityA * MAX_FUSE_FACTOR;
	if (recommended !== null && recommended <= maxA)
		return { status: 'ok', recommendedA: recommended, maxA };
	return {
		status: 'cable_too_small',
		designCurrentA,
		maxA,
		message: `No standard fuse at or above ${designCurrentA.toFixed(0)} A stays within the ${maxA.toFixed(0)} A this cable may be protected with: the cable is too small.`,
	};
}
