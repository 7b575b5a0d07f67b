import type { BuildReport, WarningCode } from './report';
import { formatShortDistance, type UnitSystem } from './units';

export interface ComputedCheck {
	key: string;
	label: string;
	status: 'pass' | 'fail';
	/** Why it failed, naming the parts concerned. */
	reasons: string[];
	/**
	 * The item's figure where it has one, larger being worse (the worst drop under burp, V): what a
	 * waiver is measured against. Null for items judged by their findings alone.
	 */
	measure: { value: number; text: string } | null;
}

const CHECKS: Array<{
	key: string;
	label: (r: Extract<BuildReport, { ok: true }>, units: UnitSystem) => string;
	codes: WarningCode[];
}> = [
	{
		key: 'battery_fusing',
		label: (r, units) =>
			`Every cable leaving a battery is fused within ${formatShortDistance(r.scenario.fuseDistanceM, units)} of it`,
		codes: ['unfused_battery_cable', 'fuse_too_far'],
	},
	{
		key: 'fuse_sizes',
		label: () => 'No fuse is larger than what its cable may be protected with',
		codes: ['fuse_above_capacity', 'cable_too_small'],
	},
	{
		key: 'cable_capacity',
		label: () => 'No cable carries more than its capacity or heats past its insulation in a burp',
		codes: ['over_capacity', 'cable_hot_in_burp'],
	},
	{
		key: 'drops',
		label: (r) => `Drops stay within the ${r.scenario.dropTargetV.toFixed(2)} V target`,
		codes: ['drop_over_target', 'cable_drop_over_target'],
	},
	{
		key: 'charge_voltage',
		label: () => "Charging voltage stays within each bank chemistry's limit",
		codes: ['charge_voltage_high'],
	},
	{
		key: 'batteries_secured',
		label: () => 'Every battery bank is secured',
		codes: ['bank_not_secured'],
	},
	{
		key: 'venting',
		label: () => 'Flooded lead-acid batteries inside the cabin are vented',
		codes: ['flooded_unvented'],
	},
	{
		key: 'operating_point',
		label: () => 'The system has an operating point at burp demand (no voltage collapse)',
		codes: ['voltage_collapse'],
	},
];

/** A computed item's short name, for lists that show no report (the team's activity). */
export const CHECK_TITLES: Record<string, string> = {
	battery_fusing: 'battery fusing',
	fuse_sizes: 'fuse sizes',
	cable_capacity: 'cable capacity',
	drops: 'voltage drops',
	charge_voltage: 'charging voltage',
	batteries_secured: 'batteries secured',
	venting: 'battery venting',
	operating_point: 'operating point at burp',
	solvable: 'solvable network',
	has_build: 'saved build',
};

/**
 * The pre-event checklist items computed from a build's report: each passes, or fails with the
 * findings that concern it. A build the engine cannot solve fails a single item with its issues.
 */
export function computedChecks(report: BuildReport, units: UnitSystem = 'metric'): ComputedCheck[] {
	if (!report.ok) {
		return [
			{
				key: 'solvable',
				label: 'The build is a network the engine can solve',
				status: 'fail',
				reasons: report.issues.map((i) => i.message),
				measure: null,
			},
		];
	}
	// The worst drop under burp: an amplifier's from its feeding sources, or one cable's.
	const worstDropV = Math.max(
		0,
		...report.amplifiers.map((a) => a.burpDropV),
		...report.cables.map((c) => Math.abs(c.burp.dropV)),
	);
	return CHECKS.map((c) => {
		const reasons = report.warnings.filter((w) => c.codes.includes(w.code)).map((w) => w.message);
		return {
			key: c.key,
			label: c.label(report, units),
			status: reasons.length ? 'fail' : 'pass',
			reasons,
			measure: c.key === 'drops' ? { value: worstDropV, text: `${worstDropV.toFixed(2)} V` } : null,
		};
	});
}

/**
 * Whether a waiver given on one revision still covers the item as it reads now: on the same
 * revision always; on a later one only if the item got no worse — its figure no higher (to the
 * hundredth it is shown to), or, for an item without a figure, no finding it did not name.
 */
export function waiverStillHolds(
	waiver: { revisionId: string | null; value: number | null; reasons: string[] | null },
	now: { revisionId: string | null; check: Pick<ComputedCheck, 'measure' | 'reasons'> },
): boolean {
	if (waiver.revisionId === null) return true; // given before waivers were scoped: kept as given
	if (waiver.revisionId === now.revisionId) return true;
	if (now.check.measure && waiver.value !== null)
		return now.check.measure.value <= waiver.value + 0.005;
	if (waiver.reasons === null) return false;
	const accepted = new Set(waiver.reasons);
	return now.check.reasons.every((r) => accepted.has(r));
}
