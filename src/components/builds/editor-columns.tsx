import {
	CHEMISTRY_PROPS,
	MATERIAL_PROPS,
	AWG_SIZES,
	CHEMISTRIES,
	MATERIALS,
	NODE_KINDS,
	PROTECTION_DEVICES,
	type ProtectionDevice,
	type Alternator,
	type Amplifier,
	type BatteryBank,
	type BuildNode,
	type Cable,
	type SteadyLoad,
} from '@/engine/browser';
import {
	fromLengthDisplay,
	fromShortDisplay,
	lengthUnit,
	shortUnit,
	toLengthDisplay,
	toShortDisplay,
	type UnitSystem,
} from '@/lib/format';
import type { PartColumn } from './PartTable';

type Opt = Array<{ value: string; label: string }>;
const num = (v: number | null) => (v === null ? Number.NaN : v);

function fuseAt(c: Cable, end: 'from' | 'to') {
	return c.fuses.find((f) => f.end === end) ?? null;
}
function setFuse(
	c: Cable,
	end: 'from' | 'to',
	patch: {
		ratingA?: number | null;
		distanceM?: number;
		device?: ProtectionDevice;
		contactResistanceOhm?: number | null;
	},
): Cable {
	const current = fuseAt(c, end);
	const others = c.fuses.filter((f) => f.end !== end);
	if (patch.ratingA === null) return { ...c, fuses: others };
	const { contactResistanceOhm, ...rest } = patch;
	const next = {
		...current,
		ratingA: current?.ratingA ?? 100,
		end,
		distanceM: current?.distanceM ?? 0.2,
		...rest,
	} as Cable['fuses'][number];
	if (contactResistanceOhm === null) delete next.contactResistanceOhm;
	else if (contactResistanceOhm !== undefined) next.contactResistanceOhm = contactResistanceOhm;
	return {
		...c,
		fuses: [...others, next].sort(
			(a, b) => (a.end === 'from' ? -1 : 1) - (b.end === 'from' ? -1 : 1),
		),
	};
}

/** The kind of protection at one end and its holder's contacts: editable once that end has one. */
function protectionColumns(end: 'from' | 'to'): PartColumn<Cable>[] {
	const at = end === 'from' ? 'start' : 'end';
	const Id = end === 'from' ? 'From' : 'To';
	return [
		{
			id: `device${Id}`,
			header: `Kind at ${at}`,
			errorPath: 'fuses',
			cell: {
				kind: 'select',
				get: (c) => fuseAt(c, end)?.device ?? 'fuse',
				set: (c, v) => (fuseAt(c, end) ? setFuse(c, end, { device: v as ProtectionDevice }) : c),
				options: PROTECTION_DEVICES.map((d) => ({ value: d, label: d })),
				inapplicable: (c) => fuseAt(c, end) === null,
			},
		},
		{
			id: `holder${Id}`,
			header: `Holder at ${at}`,
			unit: 'mΩ',
			errorPath: 'fuses',
			cell: {
				kind: 'number',
				digits: 2,
				get: (c) => {
					const r = fuseAt(c, end)?.contactResistanceOhm;
					return r === undefined ? null : r * 1000;
				},
				set: (c, v) =>
					fuseAt(c, end)
						? setFuse(c, end, { contactResistanceOhm: v === null ? null : num(v) / 1000 })
						: c,
			},
		},
	];
}

export function nodeColumns(): PartColumn<BuildNode>[] {
	return [
		{
			id: 'label',
			header: 'Name',
			errorPath: 'label',
			cell: { kind: 'text', get: (n) => n.label, set: (n, v) => ({ ...n, label: v }) },
		},
		{
			id: 'id',
			header: 'Id',
			errorPath: 'id',
			cell: { kind: 'text', get: (n) => n.id, set: (n, v) => ({ ...n, id: v }) },
		},
		{
			id: 'kind',
			header: 'Kind',
			errorPath: 'kind',
			cell: {
				kind: 'select',
				get: (n) => n.kind,
				set: (n, v) => ({ ...n, kind: v as BuildNode['kind'] }),
				options: NODE_KINDS.map((k) => ({ value: k, label: k })),
			},
		},
	];
}

export function cableColumns(nodes: Opt, units: UnitSystem): PartColumn<Cable>[] {
	const sizeOptions: Opt = [
		...AWG_SIZES.map((a) => ({ value: `awg:${a}`, label: `${a} AWG` })),
		{ value: 'mm2', label: 'mm² (nominal)' },
		{ value: 'measured', label: 'measured area' },
	];
	return [
		{
			id: 'label',
			header: 'Cable',
			errorPath: 'label',
			cell: { kind: 'text', get: (c) => c.label, set: (c, v) => ({ ...c, label: v }) },
		},
		{
			id: 'from',
			header: 'From',
			errorPath: 'from',
			cell: {
				kind: 'select',
				get: (c) => c.from,
				set: (c, v) => ({ ...c, from: v }),
				options: nodes,
			},
		},
		{
			id: 'to',
			header: 'To',
			errorPath: 'to',
			cell: { kind: 'select', get: (c) => c.to, set: (c, v) => ({ ...c, to: v }), options: nodes },
		},
		{
			id: 'size',
			header: 'Size',
			errorPath: 'size',
			cell: {
				kind: 'select',
				get: (c) => (c.size.kind === 'awg' ? `awg:${c.size.awg}` : c.size.kind),
				set: (c, v) => ({
					...c,
					size: v.startsWith('awg:')
						? { kind: 'awg', awg: v.slice(4) as Cable['size'] extends { awg: infer A } ? A : never }
						: v === 'mm2'
							? { kind: 'mm2', mm2: 25 }
							: { kind: 'measured', areaMm2: 20 },
				}),
				options: sizeOptions,
			},
		},
		{
			id: 'area',
			header: 'Area',
			unit: 'mm²',
			errorPath: (c) => (c.size.kind === 'mm2' ? 'size.mm2' : 'size.areaMm2'),
			cell: {
				kind: 'number',
				get: (c) =>
					c.size.kind === 'mm2' ? c.size.mm2 : c.size.kind === 'measured' ? c.size.areaMm2 : null,
				set: (c, v) =>
					c.size.kind === 'mm2'
						? { ...c, size: { kind: 'mm2', mm2: num(v) } }
						: c.size.kind === 'measured'
							? { ...c, size: { kind: 'measured', areaMm2: num(v) } }
							: c,
			},
		},
		{
			id: 'material',
			header: 'Material',
			errorPath: 'material',
			cell: {
				kind: 'select',
				get: (c) => c.material,
				set: (c, v) => ({ ...c, material: v as Cable['material'] }),
				options: MATERIALS.map((m) => ({ value: m, label: MATERIAL_PROPS[m].label })),
			},
		},
		{
			id: 'length',
			header: 'Length',
			unit: lengthUnit(units),
			errorPath: 'lengthM',
			cell: {
				kind: 'number',
				// Shown as people measure: 1 decimal in feet, 2 in metres (typing keeps what is typed).
				digits: units === 'imperial' ? 1 : 2,
				get: (c) => toLengthDisplay(c.lengthM, units),
				set: (c, v) => ({ ...c, lengthM: fromLengthDisplay(num(v), units) }),
			},
		},
		{
			id: 'runs',
			header: 'Runs',
			errorPath: 'parallelRuns',
			cell: {
				kind: 'number',
				get: (c) => c.parallelRuns,
				set: (c, v) => ({ ...c, parallelRuns: num(v) }),
			},
		},
		{
			id: 'fuseFrom',
			header: 'Fuse at start',
			unit: 'A',
			errorPath: 'fuses',
			cell: {
				kind: 'number',
				get: (c) => fuseAt(c, 'from')?.ratingA ?? null,
				set: (c, v) => setFuse(c, 'from', { ratingA: v === null ? null : num(v) }),
			},
		},
		{
			id: 'fuseFromAt',
			header: 'from start',
			unit: shortUnit(units),
			errorPath: 'fuses',
			cell: {
				kind: 'number',
				digits: 1,
				get: (c) =>
					fuseAt(c, 'from') ? toShortDisplay(fuseAt(c, 'from')!.distanceM, units) : null,
				set: (c, v) =>
					fuseAt(c, 'from')
						? setFuse(c, 'from', { distanceM: fromShortDisplay(num(v), units) })
						: c,
			},
		},
		...protectionColumns('from'),
		{
			id: 'fuseTo',
			header: 'Fuse at end',
			unit: 'A',
			errorPath: 'fuses',
			cell: {
				kind: 'number',
				get: (c) => fuseAt(c, 'to')?.ratingA ?? null,
				set: (c, v) => setFuse(c, 'to', { ratingA: v === null ? null : num(v) }),
			},
		},
		{
			id: 'fuseToAt',
			header: 'from end',
			unit: shortUnit(units),
			errorPath: 'fuses',
			cell: {
				kind: 'number',
				digits: 1,
				get: (c) => (fuseAt(c, 'to') ? toShortDisplay(fuseAt(c, 'to')!.distanceM, units) : null),
				set: (c, v) =>
					fuseAt(c, 'to') ? setFuse(c, 'to', { distanceM: fromShortDisplay(num(v), units) }) : c,
			},
		},
		...protectionColumns('to'),
		{
			id: 'insulation',
			header: 'Insulation',
			unit: '°C',
			errorPath: 'insulationC',
			cell: {
				kind: 'number',
				get: (c) => c.insulationC,
				set: (c, v) => ({ ...c, insulationC: num(v) }),
			},
		},
		{
			id: 'connection',
			header: 'Joints',
			unit: 'mΩ',
			errorPath: 'connectionResistanceOhm',
			cell: {
				kind: 'number',
				digits: 2,
				get: (c) =>
					c.connectionResistanceOhm === undefined ? null : c.connectionResistanceOhm * 1000,
				set: (c, v) => {
					if (v === null) {
						const { connectionResistanceOhm: _, ...rest } = c;
						return rest;
					}
					return { ...c, connectionResistanceOhm: num(v) / 1000 };
				},
			},
		},
	];
}

const terminals = <T extends { positive: string; negative: string }>(
	nodes: Opt,
): PartColumn<T & { id: string; label: string }>[] => [
	{
		id: 'positive',
		header: '+',
		errorPath: 'positive',
		cell: {
			kind: 'select',
			get: (p) => p.positive,
			set: (p, v) => ({ ...p, positive: v }),
			options: nodes,
		},
	},
	{
		id: 'negative',
		header: '−',
		errorPath: 'negative',
		cell: {
			kind: 'select',
			get: (p) => p.negative,
			set: (p, v) => ({ ...p, negative: v }),
			options: nodes,
		},
	},
];
const label = <T extends { label: string; id: string }>(header: string): PartColumn<T> => ({
	id: 'label',
	header,
	errorPath: 'label',
	cell: { kind: 'text', get: (p) => p.label, set: (p, v) => ({ ...p, label: v }) },
});

export function bankColumns(nodes: Opt): PartColumn<BatteryBank>[] {
	return [
		label('Bank'),
		...terminals<BatteryBank>(nodes),
		{
			id: 'chemistry',
			header: 'Chemistry',
			errorPath: 'chemistry',
			cell: {
				kind: 'select',
				get: (b) => b.chemistry,
				set: (b, v) => ({ ...b, chemistry: v as BatteryBank['chemistry'] }),
				options: CHEMISTRIES.map((c) => ({ value: c, label: CHEMISTRY_PROPS[c].label })),
			},
		},
		{
			id: 'cells',
			header: 'Cells/unit',
			errorPath: 'cellsPerUnit',
			cell: {
				kind: 'number',
				get: (b) => b.cellsPerUnit,
				set: (b, v) => ({ ...b, cellsPerUnit: num(v) }),
			},
		},
		{
			id: 'series',
			header: 'In series',
			errorPath: 'unitsInSeries',
			cell: {
				kind: 'number',
				get: (b) => b.unitsInSeries,
				set: (b, v) => ({ ...b, unitsInSeries: num(v) }),
			},
		},
		{
			id: 'strings',
			header: 'Strings',
			errorPath: 'stringsInParallel',
			cell: {
				kind: 'number',
				get: (b) => b.stringsInParallel,
				set: (b, v) => ({ ...b, stringsInParallel: num(v) }),
			},
		},
		{
			id: 'ah',
			header: 'Capacity/unit',
			unit: 'Ah',
			errorPath: 'unitCapacityAh',
			cell: {
				kind: 'number',
				get: (b) => b.unitCapacityAh,
				set: (b, v) => ({ ...b, unitCapacityAh: num(v) }),
			},
		},
		{
			id: 'r',
			header: 'Resistance/unit',
			unit: 'mΩ',
			errorPath: 'unitResistanceOhm',
			cell: {
				kind: 'number',
				get: (b) => b.unitResistanceOhm * 1000,
				set: (b, v) => ({ ...b, unitResistanceOhm: num(v) / 1000 }),
			},
		},
		{
			id: 'soc',
			header: 'Charge',
			unit: '%',
			errorPath: 'stateOfCharge',
			cell: {
				kind: 'number',
				get: (b) => b.stateOfCharge * 100,
				set: (b, v) => ({ ...b, stateOfCharge: num(v) / 100 }),
			},
		},
		{
			id: 'location',
			header: 'Where',
			errorPath: 'location',
			cell: {
				kind: 'select',
				get: (b) => b.location,
				set: (b, v) => ({ ...b, location: v as BatteryBank['location'] }),
				options: [
					{ value: 'engine_bay', label: 'engine bay' },
					{ value: 'cabin', label: 'cabin' },
					{ value: 'trunk', label: 'trunk' },
					{ value: 'exterior', label: 'exterior' },
				],
			},
		},
		{
			id: 'secured',
			header: 'Secured',
			errorPath: 'secured',
			cell: { kind: 'checkbox', get: (b) => b.secured, set: (b, v) => ({ ...b, secured: v }) },
		},
		{
			id: 'vented',
			header: 'Vented',
			errorPath: 'vented',
			cell: { kind: 'checkbox', get: (b) => b.vented, set: (b, v) => ({ ...b, vented: v }) },
		},
	];
}

export function alternatorColumns(nodes: Opt): PartColumn<Alternator>[] {
	return [
		label('Alternator'),
		...terminals<Alternator>(nodes),
		{
			id: 'rated',
			header: 'Rated hot',
			unit: 'A',
			errorPath: 'ratedHotA',
			cell: {
				kind: 'number',
				get: (a) => a.ratedHotA,
				set: (a, v) => ({ ...a, ratedHotA: num(v) }),
			},
		},
		{
			id: 'pulley',
			header: 'Pulley ratio',
			errorPath: 'pulleyRatio',
			cell: {
				kind: 'number',
				get: (a) => a.pulleyRatio,
				set: (a, v) => ({ ...a, pulleyRatio: num(v) }),
			},
		},
		{
			id: 'setpoint',
			header: 'Set point',
			unit: 'V',
			errorPath: 'setPointV',
			cell: {
				kind: 'number',
				get: (a) => a.setPointV,
				set: (a, v) => ({ ...a, setPointV: num(v) }),
			},
		},
	];
}

export function amplifierColumns(nodes: Opt): PartColumn<Amplifier>[] {
	return [
		label('Amplifier'),
		...terminals<Amplifier>(nodes),
		{
			id: 'power',
			header: 'Rated power',
			unit: 'W',
			errorPath: 'ratedPowerW',
			cell: {
				kind: 'number',
				get: (a) => a.ratedPowerW,
				set: (a, v) => ({ ...a, ratedPowerW: num(v) }),
			},
		},
		{
			id: 'ratedv',
			header: 'Rated at',
			unit: 'V',
			errorPath: 'ratedVoltageV',
			cell: {
				kind: 'number',
				get: (a) => a.ratedVoltageV,
				set: (a, v) => ({ ...a, ratedVoltageV: num(v) }),
			},
		},
		{
			id: 'eff',
			header: 'Efficiency',
			unit: '%',
			errorPath: 'efficiency',
			cell: {
				kind: 'number',
				get: (a) => a.efficiency * 100,
				set: (a, v) => ({ ...a, efficiency: num(v) / 100 }),
			},
		},
		{
			id: 'qty',
			header: 'Quantity',
			errorPath: 'quantity',
			cell: { kind: 'number', get: (a) => a.quantity, set: (a, v) => ({ ...a, quantity: num(v) }) },
		},
		{
			id: 'regulated',
			header: 'Regulated supply',
			errorPath: 'regulated',
			cell: { kind: 'checkbox', get: (a) => a.regulated, set: (a, v) => ({ ...a, regulated: v }) },
		},
		{
			id: 'maxout',
			header: 'Most it gives (bench)',
			unit: 'W',
			errorPath: 'maxOutputW',
			cell: {
				kind: 'number',
				get: (a) => a.maxOutputW ?? null,
				set: (a, v) => ({ ...a, maxOutputW: v }),
				blankAllowed: true,
			},
		},
	];
}

export function loadColumns(nodes: Opt): PartColumn<SteadyLoad>[] {
	return [
		label('Load'),
		...terminals<SteadyLoad>(nodes),
		{
			id: 'current',
			header: 'Current',
			unit: 'A',
			errorPath: 'currentA',
			cell: { kind: 'number', get: (l) => l.currentA, set: (l, v) => ({ ...l, currentA: num(v) }) },
		},
	];
}
