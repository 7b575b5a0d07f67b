import {
	AWG_SIZES,
	MATERIAL_PROPS,
	MATERIALS,
	PROTECTION_DEVICES,
	type Cable,
	type ProtectionDevice,
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
import { num, type Opt } from './column-kit';
import type { PartColumn } from './PartTable';

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
