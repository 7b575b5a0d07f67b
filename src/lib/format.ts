import {
	MM2_PER_CMIL,
	M_PER_FT,
	M_PER_IN,
	PART_KINDS,
	type PartGroup,
	type UnitSystem,
} from '@/engine/browser';

export type { UnitSystem };

/** Length in the user's units: feet or metres. */
export const lengthUnit = (u: UnitSystem) => (u === 'imperial' ? 'ft' : 'm');
export const toLengthDisplay = (m: number, u: UnitSystem) => (u === 'imperial' ? m / M_PER_FT : m);
export const fromLengthDisplay = (x: number, u: UnitSystem) =>
	u === 'imperial' ? x * M_PER_FT : x;
/** Short distances (fuse to battery): inches or centimetres. */
export const shortUnit = (u: UnitSystem) => (u === 'imperial' ? 'in' : 'cm');
export const toShortDisplay = (m: number, u: UnitSystem) =>
	u === 'imperial' ? m / M_PER_IN : m * 100;
export const fromShortDisplay = (x: number, u: UnitSystem) =>
	u === 'imperial' ? x * M_PER_IN : x / 100;

export function fmt(x: number | null | undefined, digits = 2): string {
	if (x === null || x === undefined || !Number.isFinite(x)) return '—';
	return x.toFixed(digits);
}

/** A document field's value as a person reads it, in their units (diffs, history). */
export function formatFieldValue(field: string, value: unknown, u: UnitSystem): string {
	if (value === undefined || value === null) return '—';
	if (typeof value === 'boolean') return value ? 'yes' : 'no';
	if (typeof value !== 'number') return String(value);
	const leaf = field.split('.').at(-1)!;
	if (leaf === 'lengthM') return `${fmt(toLengthDisplay(value, u), 1)} ${lengthUnit(u)}`;
	if (leaf === 'distanceM') return `${fmt(toShortDisplay(value, u), 0)} ${shortUnit(u)}`;
	if (leaf === 'mm2' || leaf === 'areaMm2')
		return u === 'imperial' ? `${fmt(value / MM2_PER_CMIL, 0)} cmil` : `${fmt(value, 1)} mm²`;
	if (leaf.endsWith('Ohm')) return `${fmt(value * 1000, 2)} mΩ`;
	if (leaf.endsWith('V')) return `${fmt(value, 2)} V`;
	if (leaf.endsWith('A')) return `${fmt(value, 0)} A`;
	if (leaf.endsWith('W')) return `${fmt(value, 0)} W`;
	if (leaf.endsWith('Ah')) return `${fmt(value, 0)} Ah`;
	if (leaf.endsWith('C') && leaf !== 'maxChargeC') return `${fmt(value, 0)} °C`;
	if (leaf === 'stateOfCharge' || leaf === 'efficiency') return `${fmt(value * 100, 0)} %`;
	return String(Number(value.toPrecision(6)));
}

const FIELD_NAMES: Record<string, string> = {
	lengthM: 'length',
	'size.awg': 'size (AWG)',
	'size.kind': 'size given as',
	'size.mm2': 'cross-section',
	'size.areaMm2': 'measured cross-section',
	material: 'material',
	parallelRuns: 'parallel runs',
	insulationC: 'insulation rating',
	setPointV: 'regulator set point',
	ratedHotA: 'rated hot output',
	pulleyRatio: 'pulley ratio',
	ratedPowerW: 'rated power',
	stringsInParallel: 'strings in parallel',
	unitsInSeries: 'units in series',
	unitCapacityAh: 'capacity per unit',
	unitResistanceOhm: 'internal resistance per unit',
	stateOfCharge: 'state of charge',
	currentA: 'current',
	closes: 'conducts',
	closedResistanceOhm: 'closed resistance',
	forwardDropV: 'forward drop',
};

export function fieldName(field: string): string {
	if (FIELD_NAMES[field]) return FIELD_NAMES[field];
	const fuse = /^fuses\.(\d)\.(\w+)$/.exec(field);
	if (fuse)
		return `fuse ${Number(fuse[1]) + 1} ${fuse[2] === 'ratingA' ? 'rating' : fuse[2] === 'distanceM' ? 'distance' : 'end'}`;
	return field.replace(/([A-Z])/g, ' $1').toLowerCase();
}

/** A part's kind as a line names it ("Steady load"), from the engine's registry. */
export const GROUP_NAMES = Object.fromEntries(
	Object.entries(PART_KINDS).map(([group, kind]) => [group, kind.one]),
) as Record<PartGroup, string>;

/** A price in the team's currency (ISO 4217 code), e.g. "$1,234.50" or "€86.35". */
export function formatMoney(x: number, currency: string): string {
	try {
		return new Intl.NumberFormat('en', {
			style: 'currency',
			currency,
			minimumFractionDigits: 2,
			maximumFractionDigits: 2,
		}).format(x);
	} catch {
		return `${x.toFixed(2)} ${currency}`;
	}
}

/** Which part a validation path names, in words: `cables.9.lengthM` → Cable “Amplifier 2 feed”. */
export function partOfPath(
	doc: Partial<Record<PartGroup, Array<{ id: string; label?: string }>>>,
	path: string,
): string {
	const [group, index] = path.split('.');
	if (!group || !(group in GROUP_NAMES)) return 'The build';
	const part = doc[group as PartGroup]?.[Number(index)];
	const name = GROUP_NAMES[group as PartGroup];
	return part ? `${name} “${part.label || part.id}”` : name;
}
