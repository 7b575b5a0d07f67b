import {
	CHEMISTRY_PROPS,
	CHEMISTRIES,
	NODE_KINDS,
	type Alternator,
	type Amplifier,
	type BatteryBank,
	type BuildNode,
	type CapacitorBank,
	type SteadyLoad,
} from '@/engine/browser';
import { label, num, type Opt, terminals } from './column-kit';
import type { PartColumn } from './PartTable';

export { cableColumns } from './cable-columns';
export { chargerColumns, isolatorColumns } from './switching-columns';

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

export function capacitorColumns(nodes: Opt): PartColumn<CapacitorBank>[] {
	const field = (
		id: keyof CapacitorBank,
		header: string,
		unit: string | undefined,
		scale = 1,
		step = 'any',
	): PartColumn<CapacitorBank> => ({
		id,
		header,
		unit,
		errorPath: id,
		cell: {
			kind: 'number',
			step,
			get: (c) => (c[id] as number) * scale,
			set: (c, v) => ({ ...c, [id]: num(v) / scale }),
		},
	});
	return [
		label('Capacitor bank'),
		...terminals<CapacitorBank>(nodes),
		field('inSeries', 'Modules in series', undefined, 1, '1'),
		field('inParallel', 'Strings', undefined, 1, '1'),
		field('moduleFarads', 'Capacitance per module', 'F'),
		field('moduleEsrOhm', 'Series resistance per module', 'mΩ', 1000),
		field('moduleRatedV', 'Rated voltage per module', 'V'),
		field('moduleLeakageA', 'Leakage per module', 'mA', 1000),
	];
}
