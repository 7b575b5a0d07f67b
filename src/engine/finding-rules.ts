import { outputLossDb } from './amplifier';
import { CHEMISTRY_PROPS } from './battery';
import { describeFeed } from './feed';
import { MAX_FUSE_FACTOR } from './fuses';
import type { NetworkSolution } from './solve';
import type {
	Alternator,
	Amplifier,
	BatteryBank,
	BuildDocument,
	Cable,
	CapacitorBank,
	DcDcCharger,
	Fuse,
	Scenario,
} from './types';
import { formatShortDistance, type UnitSystem } from './units';
import type {
	AlternatorReport,
	AmplifierReport,
	BankReport,
	CableReport,
	CapacitorReport,
	ChargerReport,
	Severity,
	WarningCode,
} from './report-types';

/** Set point above which a stock vehicle's electronics are at risk: common practice, no published source. */
export const VEHICLE_SET_POINT_LIMIT_V = 15.0;

const fmt = (x: number, digits = 2) => x.toFixed(digits);

/** What every rule may read: the document, the conditions and the figures already worked out. */
export interface FindingContext {
	doc: BuildDocument;
	scenario: Scenario;
	units: UnitSystem;
	sustained: NetworkSolution;
	burp: NetworkSolution;
	/** Node ids that are a bank's positive terminal. */
	bankPositives: ReadonlySet<string>;
	nodeLabel: (id: string) => string;
}

/** A part and its figures in the report, as a rule about that kind of part sees them. */
export interface Subjects {
	cable: { part: Cable; figures: CableReport };
	amplifier: { part: Amplifier; figures: AmplifierReport };
	bank: { part: BatteryBank; figures: BankReport };
	alternator: { part: Alternator; figures: AlternatorReport };
	capacitor: { part: CapacitorBank; figures: CapacitorReport };
	charger: { part: DcDcCharger; figures: ChargerReport };
	build: { part: BuildDocument; figures: null };
}
export type RuleSubject = keyof Subjects;

/**
 * One finding: its code, how grave it is, whether it concerns safety, the kind of part it is about
 * and the figures it reads (for the reader; the test below reads only those), and its test, which
 * answers the message of each time it fires (none when all is well), in the member's units.
 */
export interface FindingRule<K extends RuleSubject = RuleSubject> {
	code: WarningCode;
	severity: Severity;
	safety: boolean;
	about: K;
	reads: readonly string[];
	test: (subject: Subjects[K], ctx: FindingContext) => string[];
}

/** A rule about any one kind of part. */
export type AnyFindingRule = { [K in RuleSubject]: FindingRule<K> }[RuleSubject];

const rule = <K extends RuleSubject>(r: FindingRule<K>): FindingRule<K> => r;
const when = (cond: boolean, message: () => string): string[] => (cond ? [message()] : []);
const abs = Math.abs;
/** What the protection is called in a message: breakers are sized and checked like fuses. */
const device = (f: Fuse) => f.device ?? 'fuse';

/** The ends of a cable that sit on a bank's positive terminal. */
export const batteryEnds = (cable: Cable, ctx: FindingContext) =>
	(['from', 'to'] as const).filter((end) => ctx.bankPositives.has(cable[end]));

/**
 * Every finding the report makes, in the order a part's findings are listed. Adding one is an
 * entry here and its test.
 */
export const FINDING_RULES = [
	rule({
		code: 'voltage_collapse',
		severity: 'danger',
		safety: false,
		about: 'build',
		reads: ['sustained.status', 'burp.status', 'solvedDemandFraction'],
		test: (_, ctx) =>
			(
				[
					['sustained music', ctx.sustained],
					['burp', ctx.burp],
				] as const
			)
				.filter(([, s]) => s.status === 'collapse')
				.map(
					([name, s]) =>
						`At ${name} demand the system has no operating point: the sources can carry only ${fmt(s.solvedDemandFraction * 100, 0)} % of it before the voltage collapses.`,
				),
	}),
	rule({
		code: 'cable_drop_over_target',
		severity: 'warning',
		safety: false,
		about: 'cable',
		reads: ['burp.dropV', 'scenario.dropTargetV'],
		test: ({ part, figures: f }, { scenario }) =>
			when(
				abs(f.burp.dropV) > scenario.dropTargetV,
				() =>
					`"${part.label}" drops ${fmt(abs(f.burp.dropV))} V under burp, over the ${fmt(scenario.dropTargetV)} V target.`,
			),
	}),
	rule({
		code: 'cmil_below_rule',
		severity: 'warning',
		safety: false,
		about: 'cable',
		reads: ['cmilPerAmp', 'requiredCmilPerAmp', 'designCurrentA'],
		test: ({ part, figures: f }) =>
			when(
				f.cmilPerAmp < f.requiredCmilPerAmp,
				() =>
					`"${part.label}" offers ${fmt(f.cmilPerAmp, 0)} cmil/A at ${fmt(f.designCurrentA, 0)} A; the rule of thumb for this material is ${fmt(f.requiredCmilPerAmp, 0)} cmil/A.`,
			),
	}),
	rule({
		code: 'over_capacity',
		severity: 'danger',
		safety: true,
		about: 'cable',
		reads: ['sustained.currentA', 'ampacity'],
		test: ({ part, figures: f }) =>
			when(
				f.ampacity !== null && abs(f.sustained.currentA) > f.ampacity.currentA,
				() =>
					`"${part.label}" carries ${fmt(abs(f.sustained.currentA), 0)} A sustained, above the ${fmt(f.ampacity!.currentA, 0)} A it can carry continuously: it will overheat.`,
			),
	}),
	rule({
		code: 'unfused_battery_cable',
		severity: 'danger',
		safety: true,
		about: 'cable',
		reads: ['from', 'to', 'fuses'],
		test: ({ part }, ctx) =>
			batteryEnds(part, ctx)
				.filter((end) => !part.fuses.some((f) => f.end === end))
				.map(
					(end) =>
						`"${part.label}" leaves the battery positive at "${ctx.nodeLabel(part[end])}" with no fuse or breaker at that end.`,
				),
	}),
	rule({
		code: 'fuse_too_far',
		severity: 'danger',
		safety: true,
		about: 'cable',
		reads: ['from', 'to', 'fuses', 'scenario.fuseDistanceM'],
		test: ({ part }, ctx) =>
			batteryEnds(part, ctx).flatMap((end) => {
				const fuse = part.fuses.find((f) => f.end === end);
				return when(
					fuse !== undefined && fuse.distanceM > ctx.scenario.fuseDistanceM,
					() =>
						`The ${device(fuse!)} on "${part.label}" sits ${formatShortDistance(fuse!.distanceM, ctx.units)} from the battery at "${ctx.nodeLabel(part[end])}"; keep it within ${formatShortDistance(ctx.scenario.fuseDistanceM, ctx.units)}.`,
				);
			}),
	}),
	rule({
		code: 'fuse_above_capacity',
		severity: 'danger',
		safety: true,
		about: 'cable',
		reads: ['fuses', 'ampacity'],
		test: ({ part, figures: f }) =>
			part.fuses
				.filter((fuse) => f.ampacity && fuse.ratingA > f.ampacity.currentA * MAX_FUSE_FACTOR)
				.map(
					(fuse) =>
						`The ${fmt(fuse.ratingA, 0)} A ${device(fuse)} on "${part.label}" is above the ${fmt(f.ampacity!.currentA * MAX_FUSE_FACTOR, 0)} A the cable may be protected with: it would not blow before the cable overheats.`,
				),
	}),
	rule({
		code: 'fuse_below_demand',
		severity: 'warning',
		safety: false,
		about: 'cable',
		reads: ['fuses', 'designCurrentA'],
		test: ({ part, figures: f }) =>
			part.fuses
				.filter((fuse) => fuse.ratingA < f.designCurrentA)
				.map(
					(fuse) =>
						`The ${fmt(fuse.ratingA, 0)} A ${device(fuse)} on "${part.label}" is below the ${fmt(f.designCurrentA, 0)} A it carries under burp.`,
				),
	}),
	rule({
		code: 'cable_hot_in_burp',
		severity: 'danger',
		safety: true,
		about: 'cable',
		reads: ['burpHeating', 'burp.currentA', 'scenario.burpSeconds'],
		test: ({ part, figures: f }, { scenario }) =>
			when(
				f.burpHeating.finalC > f.burpHeating.limitC,
				() =>
					`"${part.label}" would heat from ${fmt(scenario.conductorTempC, 0)} °C to ${f.burpHeating.finalC > 999 ? 'over 999' : fmt(f.burpHeating.finalC, 0)} °C over a ${fmt(scenario.burpSeconds, 0)} s burp at ${fmt(abs(f.burp.currentA), 0)} A, past its ${fmt(f.burpHeating.limitC, 0)} °C insulation (adiabatic estimate, IEC 60949).`,
			),
	}),
	rule({
		code: 'cable_too_small',
		severity: 'danger',
		safety: true,
		about: 'cable',
		reads: ['fuseAdvice'],
		test: ({ part, figures: f }) =>
			f.fuseAdvice?.status === 'cable_too_small'
				? [`"${part.label}": ${f.fuseAdvice.message}`]
				: [],
	}),
	rule({
		code: 'drop_over_target',
		severity: 'warning',
		safety: false,
		about: 'amplifier',
		reads: ['burpDropV', 'burpDropReference', 'burpTerminalV', 'scenario.dropTargetV'],
		test: ({ part, figures: f }, { scenario }) =>
			when(
				f.burpDropV > scenario.dropTargetV,
				() =>
					`"${part.label}" sees ${fmt(f.burpDropV)} V less under burp than the terminals of ${describeFeed(f.burpDropReference)}, lost in its feed and return (target ${fmt(scenario.dropTargetV)} V): ${fmt(-outputLossDb(part, f.burpTerminalV))} dB below its rating.`,
			),
	}),
	rule({
		code: 'charge_voltage_high',
		severity: 'danger',
		safety: true,
		about: 'bank',
		reads: ['alternators.setPointV', 'maxChargeV', 'chemistry'],
		test: ({ part, figures: f }, { doc }) =>
			doc.alternators
				.filter((alt) => alt.setPointV > f.maxChargeV)
				.map(
					(alt) =>
						`Regulator "${alt.label}" is set to ${fmt(alt.setPointV)} V, above the ${fmt(f.maxChargeV)} V limit of "${part.label}" (${CHEMISTRY_PROPS[part.chemistry].label}): it will be overcharged.`,
				),
	}),
	rule({
		code: 'charge_voltage_low',
		severity: 'warning',
		safety: false,
		about: 'bank',
		reads: ['alternators.setPointV', 'floatV'],
		test: ({ part, figures: f }, { doc }) =>
			doc.alternators
				.filter((alt) => alt.setPointV <= f.maxChargeV && alt.setPointV < f.floatV)
				.map(
					(alt) =>
						`Regulator "${alt.label}" is set to ${fmt(alt.setPointV)} V, below the ${fmt(f.floatV)} V float voltage of "${part.label}": it will never fill.`,
				),
	}),
	rule({
		code: 'bank_not_secured',
		severity: 'danger',
		safety: true,
		about: 'bank',
		reads: ['secured'],
		test: ({ part }) => when(!part.secured, () => `"${part.label}" is not marked as secured.`),
	}),
	rule({
		code: 'flooded_unvented',
		severity: 'danger',
		safety: true,
		about: 'bank',
		reads: ['chemistry', 'location', 'vented'],
		test: ({ part }) =>
			when(
				part.chemistry === 'flooded' && part.location === 'cabin' && !part.vented,
				() =>
					`"${part.label}" is flooded lead-acid inside the cabin without venting: charging gives off hydrogen.`,
			),
	}),
	rule({
		code: 'bank_charge_limited',
		severity: 'info',
		safety: false,
		about: 'bank',
		reads: ['sustainedChargeLimited', 'chargeAcceptanceA'],
		test: ({ part, figures: f }) =>
			when(
				f.sustainedChargeLimited,
				() =>
					`"${part.label}" takes ${fmt(f.chargeAcceptanceA, 0)} A under sustained music, all it accepts at this state of charge: it charges as fast as it can, and more alternator current would not fill it sooner.`,
			),
	}),
	rule({
		code: 'set_point_above_vehicle',
		severity: 'warning',
		safety: true,
		about: 'alternator',
		reads: ['setPointV'],
		test: ({ part }) =>
			when(
				part.setPointV > VEHICLE_SET_POINT_LIMIT_V,
				() =>
					`Regulator "${part.label}" is set to ${fmt(part.setPointV)} V: above about ${fmt(VEHICLE_SET_POINT_LIMIT_V, 1)} V the vehicle's own electronics may be damaged. Check what the vehicle was designed for.`,
			),
	}),
	rule({
		code: 'sustained_deficit',
		severity: 'warning',
		safety: false,
		about: 'build',
		reads: ['sustained.status', 'sustained.banks.currentA', 'scenario.engineRpm'],
		test: (_, { sustained, scenario }) => {
			const draw = sustained.banks.reduce((s, b) => s + b.currentA, 0);
			return when(
				sustained.status === 'ok' && draw > 0.5,
				() =>
					`At ${scenario.engineRpm} rpm and sustained music the banks supply ${fmt(draw, 0)} A: the alternators cannot keep up, so the banks run down.`,
			);
		},
	}),
	rule({
		code: 'capacitor_over_rating',
		severity: 'danger',
		safety: true,
		about: 'capacitor',
		reads: ['highestV', 'ratedV'],
		test: ({ part, figures: f }) =>
			when(
				f.highestV > f.ratedV,
				() =>
					`Capacitor bank "${part.label}" sits at ${fmt(f.highestV)} V, above its rating of ${fmt(f.ratedV)} V (${part.inSeries} × ${fmt(part.moduleRatedV)} V): an over-voltage module can vent or fail. Add modules in series, or lower the charging voltage; follow the maker's limits.`,
			),
	}),
	rule({
		code: 'capacitor_burp_share',
		severity: 'info',
		safety: false,
		about: 'capacitor',
		reads: ['shareFirst100ms', 'burpPeakA'],
		test: ({ part, figures: f }) =>
			f.shareFirst100ms === null || f.burpPeakA === null
				? []
				: [
						`Capacitor bank "${part.label}" carries ${fmt(f.shareFirst100ms * 100, 0)} % of what the sources deliver in the first 100 ms of the burp (up to ${fmt(f.burpPeakA, 0)} A); the banks and alternators carry the rest and all of what follows.`,
					],
	}),
	rule({
		code: 'charger_at_limit',
		severity: 'info',
		safety: false,
		about: 'charger',
		reads: ['atLimit', 'limitA', 'outputV', 'inputA'],
		test: ({ part, figures: f }) =>
			when(
				f.atLimit,
				() =>
					`DC-DC charger "${part.label}" runs at its limit of ${fmt(f.limitA, 0)} A under sustained music (its output at ${fmt(f.outputV)} V, drawing ${fmt(f.inputA, 0)} A from its input): the bank behind it charges no faster than that.`,
			),
	}),
] as const satisfies readonly AnyFindingRule[];
